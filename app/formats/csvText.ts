/**
 * CSV text as strings, for the lines a sniffer and a header need (the sample rows are read from bytes, see
 * csvRows.ts): fields split at a separator outside double quotes (RFC 4180, `""` for a quote inside one),
 * names split from their units, numbers read with either decimal mark.
 */

/** Splits one line at `separator` outside double quotes; quotes are removed, spaces around a field trimmed. */
export function splitCsvLine(line: string, separator: string): string[] {
  const fields: string[] = [];
  let current = '';
  let quoted = false;
  let wasQuoted = false;
  for (let index = 0; index < line.length; index++) {
    const character = line[index];
    if (quoted) {
      if (character === '"') {
        if (line[index + 1] === '"') {
          current += '"';
          index++;
        } else {
          quoted = false;
        }
      } else {
        current += character;
      }
    } else if (character === '"' && current.trim() === '') {
      quoted = true;
      wasQuoted = true;
      current = '';
    } else if (character === separator) {
      fields.push(wasQuoted ? current : current.trim());
      current = '';
      wasQuoted = false;
    } else if (!(wasQuoted && (character === ' ' || character === '\t'))) {
      current += character;
    }
  }
  fields.push(wasQuoted ? current : current.trim());
  return fields;
}

/** Drops empty fields at the end of a line (spreadsheets write `1,2,3,,` for a row shorter than the widest). */
export function withoutTrailingEmpty(fields: string[]): string[] {
  let length = fields.length;
  while (length > 0 && fields[length - 1].trim() === '') length--;
  return length === fields.length ? fields : fields.slice(0, length);
}

const numberPattern = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

/** A field as a number with the given decimal mark (`.` or `,`), or NaN. `NaN` itself reads as NaN too: check `isNotANumberWord`. */
export function numberOfText(text: string, decimalMark: string): number {
  let trimmed = text.trim();
  if (decimalMark === ',') {
    if (trimmed.includes('.')) return Number.NaN;
    trimmed = trimmed.replace(',', '.');
  }
  return numberPattern.test(trimmed) ? Number(trimmed) : Number.NaN;
}

export function isNotANumberWord(text: string): boolean {
  return text.trim().toLowerCase() === 'nan';
}

/** Seconds per unit of time, by the unit's usual symbols (SI; `us` is the ASCII spelling of µs). */
export const secondsPerTimeUnit: Readonly<Record<string, number>> = { s: 1, ms: 1e-3, us: 1e-6, 'µs': 1e-6, 'μs': 1e-6, ns: 1e-9 };
/** Volts per unit of voltage. */
export const voltsPerUnit: Readonly<Record<string, number>> = { v: 1, mv: 1e-3, uv: 1e-6, 'µv': 1e-6, 'μv': 1e-6, kv: 1e3 };

function isKnownUnit(unit: string): boolean {
  return unit in secondsPerTimeUnit || unit.toLowerCase() in voltsPerUnit;
}

export interface NameAndUnit {
  /** The name without its unit, e.g. `CH1` from `CH1 (V)`. */
  name: string;
  /** The unit as written (without brackets), or '' when the header gives none. */
  unit: string;
}

/**
 * Splits a column header into name and unit: `CH1 (V)`, `Time [ms]`, `t / s` (ISO 80000 quantity / unit),
 * or a known unit after a space or underscore (`Time us`, `t_ms`). Anything else is a name without a unit.
 */
export function splitNameAndUnit(header: string): NameAndUnit {
  const text = header.trim();
  const bracketed = /^(.*?)\s*[([]\s*([^()[\]]*?)\s*[)\]]$/.exec(text);
  if (bracketed && bracketed[1] !== '') return { name: bracketed[1].trim(), unit: bracketed[2] };
  const slashed = /^(.*\S)\s*\/\s*([^/\s]+)$/.exec(text);
  if (slashed && isKnownUnit(slashed[2])) return { name: slashed[1], unit: slashed[2] };
  const suffixed = /^(.*[^\s_])[\s_]+([^\s_]+)$/.exec(text);
  if (suffixed && isKnownUnit(suffixed[2])) return { name: suffixed[1], unit: suffixed[2] };
  return { name: text, unit: '' };
}

/** True for a field that is only a unit, as in a second header line under the names: `(s)`, `[V]`, `mV`. */
export function isUnitOnly(field: string): boolean {
  const text = field.trim();
  if (text === '') return true;
  const inner = /^[([]\s*([^()[\]]*?)\s*[)\]]$/.exec(text)?.[1] ?? text;
  return isKnownUnit(inner) || /^(a|ma|%|deg|°|hz)$/i.test(inner);
}
