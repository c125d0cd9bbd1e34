/**
 * The design file's position keys. They belong in files, JSON and code; a person reads parts in words with their
 * designators ("emitter resistor R14"), so no text meant for people may contain one (issue 11).
 */
export const roleIdentifiers = ['rEmitter', 'rBiasTop', 'rBiasBottom', 'cRamp', 'rDischarge', 'rControlTop', 'potControl'] as const;

export const roleIdentifierPattern = new RegExp(`\\b(${roleIdentifiers.join('|')})\\b`);

/** The role identifiers found in a text, for a readable failure. */
export function roleIdentifiersIn(text: string): string[] {
  return [...text.matchAll(new RegExp(roleIdentifierPattern.source, 'g'))].map((match) => match[0]);
}
