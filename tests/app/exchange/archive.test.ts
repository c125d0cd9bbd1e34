/** The archive schema and the CSV tables (pure parts of the exchange). */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { archiveColumns, fromArchiveCell, tableSchema, toArchiveCell } from '../../../app/exchange/archiveSchema';
import { transferPointsCsv } from '../../../app/exchange/recordCsv';
import { csvField, formatCsvTable } from '../../../app/exchange/tableCsv';

describe('archive tables', () => {
  it('accepts exactly the documented columns and rows of that width', () => {
    const schema = tableSchema(archiveColumns.trims);
    expect(schema.safeParse({ columns: [...archiveColumns.trims], rows: [['R14', 6800, 7500, 'trim plan', 'why', 1]] }).success).toBe(true);
    expect(schema.safeParse({ columns: [...archiveColumns.trims].reverse(), rows: [] }).success).toBe(false);
    expect(schema.safeParse({ columns: [...archiveColumns.trims], rows: [['R14', 6800]] }).success).toBe(false);
    expect(schema.safeParse({ columns: [...archiveColumns.trims], rows: [[{}, 1, 2, 3, 4, 5]] }).success).toBe(false);
  });

  it('cells survive JSON both ways, infinities included', () => {
    fc.assert(
      fc.property(fc.oneof(fc.double(), fc.string(), fc.constant(null)), (value) => {
        if (typeof value === 'number' && Number.isNaN(value)) return; // SQLite never stores NaN (it becomes NULL)
        const back = fromArchiveCell(JSON.parse(JSON.stringify(toArchiveCell(value))));
        if (value === 'Infinity' || value === '-Infinity') return; // a text column never holds these words (our rule, ARCHIVE.md)
        expect(Object.is(back, value) || (value === 0 && back === 0)).toBe(true);
      }),
      { numRuns: 300 },
    );
  });
});

describe('CSV tables', () => {
  it('quotes per RFC 4180 and prints numbers exactly', () => {
    expect(csvField('ramp peak 4 % high, one step up')).toBe('"ramp peak 4 % high, one step up"');
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
    expect(csvField(0.1 + 0.2)).toBe('0.30000000000000004');
    expect(formatCsvTable(['a', 'b'], [[1, null], [true, 'x\ny']])).toBe('a,b\n1,\nyes,"x\ny"\n');
    const text = transferPointsCsv([{ t: 0.018333, controlV: 2.0689828956516516, alphaDeg: 52.4985561951297 }]);
    expect(text.split('\n')[1].split(',').map(Number)).toEqual([0.018333, 2.0689828956516516, 52.4985561951297]);
  });
});
