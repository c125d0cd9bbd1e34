/**
 * The caution printed by the demo and shown by the screens, once. Measuring on boards fed from the mains is
 * dangerous; the points are common practice for work on mains-derived signals.
 */
export const safetyNoteLines: readonly string[] = [
  'Safety when measuring on a firing board:',
  '- Take the sync signal from an isolated source (the board\'s own sync transformer), never straight from the mains.',
  '- The logger\'s ground goes to the board\'s control ground only, never to mains, the thyristor cathode or the power stage.',
  '- Use differential or isolated probes for anything referred to the power stage.',
  '- Follow your local electrical codes and licensed practice; where they differ from this note, they win.',
];

export function safetyNoteText(): string {
  return safetyNoteLines.join('\n');
}
