import { InputError } from '../errors';
import { signalRoles, type SignalRole } from '../capture/samples';

/** What each CSV column holds: the time, a signal by role, or nothing we read. */
export type CsvColumn = 'time' | SignalRole | 'ignored';

export interface CsvLayout {
  columns: CsvColumn[];
  names: string[];
  hasTime: boolean;
  hasControl: boolean;
}

const timeNames = new Set(['t', 'time', 't_s', 'time_s']);
const requiredRoles: readonly SignalRole[] = ['sync', 'ramp', 'gate'];

/**
 * Reads the header line `t,sync,ramp,gate[,control]` (NAMING.md: a capture is t plus one column per signal, volts).
 * Column order is free, extra columns are ignored, names are case-insensitive and may be quoted or padded.
 */
export function parseCsvHeader(text: string, where: string): CsvLayout {
  const names = text.split(',').map((name) => name.trim().replace(/^"(.*)"$/, '$1').trim());
  const columns: CsvColumn[] = [];
  const seen = new Map<CsvColumn, number>();
  names.forEach((name, index) => {
    const lower = name.toLowerCase();
    let column: CsvColumn = 'ignored';
    if (timeNames.has(lower)) column = 'time';
    else if ((signalRoles as readonly string[]).includes(lower)) column = lower as SignalRole;
    if (column !== 'ignored') {
      const earlier = seen.get(column);
      if (earlier !== undefined) {
        throw new InputError(`column "${name}" appears twice in the header (columns ${earlier + 1} and ${index + 1})`, where);
      }
      seen.set(column, index);
    }
    columns.push(column);
  });
  const missing = requiredRoles.filter((role) => !seen.has(role));
  if (missing.length > 0) {
    if (names.length === 1 && /[;\t]/.test(text)) {
      throw new InputError('the header has no commas: fields must be separated by commas (t,sync,ramp,gate[,control]), not semicolons or tabs', where);
    }
    const shown = names.slice(0, 8).join(', ') + (names.length > 8 ? ', ...' : '');
    throw new InputError(
      `the header lacks the required column${missing.length > 1 ? 's' : ''} ${missing.join(', ')} ` +
        `(a capture needs t,sync,ramp,gate[,control]; this header has: ${shown})`,
      where,
    );
  }
  return { columns, names, hasTime: seen.has('time'), hasControl: seen.has('control') };
}
