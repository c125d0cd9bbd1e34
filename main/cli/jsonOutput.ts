/**
 * The one way a command prints JSON. JSON has no NaN or infinity: `JSON.stringify` would quietly write `null`
 * where a reading went wrong, and a reader would take it for "not measured". A non-finite number reaching the
 * output is a bug upstream (a value the edge should have refused), so it stops the command here, naming the
 * field, instead of printing a confident wrong answer.
 */

/** The path of the first non-finite number in `value` (`ramp.peakV`, `checks[3].measured`), or null. */
export function firstNonFiniteNumber(value: unknown, path = ''): string | null {
  if (typeof value === 'number') return Number.isFinite(value) ? null : path || '(the whole value)';
  if (Array.isArray(value)) {
    for (let index = 0; index < value.length; index += 1) {
      const found = firstNonFiniteNumber(value[index], `${path}[${index}]`);
      if (found !== null) return found;
    }
    return null;
  }
  if (typeof value === 'object' && value !== null) {
    if (typeof (value as { toJSON?: unknown }).toJSON === 'function') return null;
    for (const [key, member] of Object.entries(value)) {
      const found = firstNonFiniteNumber(member, path ? `${path}.${key}` : key);
      if (found !== null) return found;
    }
  }
  return null;
}

/** `value` as indented JSON text with a final newline; throws (a bug) if any number in it is NaN or infinite. */
export function jsonOutput(value: unknown): string {
  const bad = firstNonFiniteNumber(value);
  if (bad !== null) throw new Error(`the result holds a value that is not a finite number at ${bad}`);
  return `${JSON.stringify(value, null, 2)}\n`;
}
