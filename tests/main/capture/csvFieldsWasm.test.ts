/**
 * The parser threads' plain-row path in WebAssembly (wasm/csvFields.ts, built by `npm run build`) against the
 * TypeScript parser it accelerates: on random chunks that mix plain rows with every form the fast path must leave
 * alone (exponents, 20 digits and more, quotes, text, blanks, too few columns, CRLF, trailing separators), the columns,
 * the row and line counts, the line of each row and the first fault are the same, bit for bit (Object.is: -0 and
 * NaN told apart). And each number it takes equals Number() of its text (ECMAScript's own reading, the reference).
 */
import { existsSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { isChunkFailure, parseCsvChunk, type CsvChunkColumns, type CsvRowAccelerator } from '../../../app/formats/csvChunk';
import type { CsvRowPlan } from '../../../app/formats/csvRows';
import { createWasmRowAccelerator, csvFieldsWasmPath, loadCsvFieldsModule } from '../../../main/capture/csvFieldsWasm';

const wasmPath = csvFieldsWasmPath();
if (!existsSync(wasmPath)) throw new Error(`${wasmPath} is missing: run npm run build (npm test does) before these tests`);
const fields = loadCsvFieldsModule() as WebAssembly.Module;

const comma = 0x2c;
const semicolon = 0x3b;
const tab = 0x09;
const dot = 0x2e;

/** time, sync, ramp, gate (and control when `withControl`); factors as a unit in the header would give them. */
function planOf(separator: number, decimalMark: number, withControl: boolean, skipSecond: boolean): CsvRowPlan {
  const slots = withControl ? [0, 1, 2, 3, 4] : [0, 1, 2, 3];
  if (skipSecond) slots.splice(1, 0, -1);
  return {
    separator,
    decimalMark,
    columnCount: slots.length,
    slots: Int8Array.from(slots),
    factors: Float64Array.from([1e-3, 1, 10, 1, 0.5]),
    columnLabels: slots.map((_, index) => `c${index}`),
  };
}

/** Counts the rows the accelerator took, so a test can tell that the fast path ran at all. */
function counting(accelerator: CsvRowAccelerator): CsvRowAccelerator & { taken: number } {
  const wrapped = {
    taken: 0,
    get stop() {
      return accelerator.stop;
    },
    load: accelerator.load.bind(accelerator),
    take(...args: Parameters<CsvRowAccelerator['take']>) {
      const taken = accelerator.take(...args);
      wrapped.taken += taken;
      return taken;
    },
  };
  return wrapped;
}

function expectSameColumns(actual: CsvChunkColumns, expected: CsvChunkColumns): void {
  expect(actual.rows).toBe(expected.rows);
  expect(actual.lines).toBe(expected.lines);
  for (const name of ['time', 'sync', 'ramp', 'gate', 'control'] as const) {
    for (let row = 0; row < expected.rows; row++) {
      if (!Object.is(actual[name][row], expected[name][row])) throw new Error(`${name}[${row}]: ${actual[name][row]} and ${expected[name][row]}`);
    }
  }
  expect(actual.rowLines === null ? null : Array.from(actual.rowLines.subarray(0, actual.rows))).toEqual(expected.rowLines === null ? null : Array.from(expected.rowLines.subarray(0, expected.rows)));
}

const digitText = (count: number) => fc.array(fc.integer({ min: 0, max: 9 }), { minLength: count, maxLength: count }).map((digits) => digits.join(''));

/**
 * A number as instruments and our writer print it: mostly a few whole digits and up to 17 decimals, sometimes up to
 * 19 whole digits and 22 decimals (past what the WebAssembly path takes).
 */
const plainNumber = fc
  .tuple(
    fc.constantFrom('', '-', '+'),
    fc.oneof({ weight: 6, arbitrary: fc.integer({ min: 0, max: 3 }) }, { weight: 1, arbitrary: fc.integer({ min: 0, max: 19 }) }),
    fc.oneof({ weight: 6, arbitrary: fc.integer({ min: 0, max: 17 }) }, { weight: 1, arbitrary: fc.integer({ min: 0, max: 22 }) }),
    fc.integer({ min: 0, max: 3 }),
  )
  .chain(([sign, whole, fraction, zeros]) => fc.tuple(fc.constant(sign), digitText(whole), fc.constant('0'.repeat(zeros)), digitText(fraction)))
  .map(([sign, whole, zeros, fraction]) => (fraction.length > 0 ? `${sign}${whole}.${zeros}${fraction}` : `${sign}${whole || '0'}`));

const oddField = fc.constantFrom('1e-7', '2.5E3', '12345678901234567890123', '"1.5"', 'NaN', 'abc', '', ' ', ' 3.25 ', '\t-4', '.5', '5.', '-0', '0.000000000000000000000000000012', '9007199254740993', '0.9007199254740993', '1.5V');

function textOf(field: string, plan: CsvRowPlan): string {
  return plan.decimalMark === dot ? field : field.replace('.', ',');
}

const chunkOf = (plan: CsvRowPlan) =>
  fc
    .array(
      fc.oneof(
        { weight: 8, arbitrary: fc.array(plainNumber, { minLength: plan.columnCount, maxLength: plan.columnCount }) },
        { weight: 2, arbitrary: fc.array(fc.oneof(plainNumber, oddField), { minLength: plan.columnCount - 1, maxLength: plan.columnCount + 1 }) },
        { weight: 1, arbitrary: fc.constant([] as string[]) },
      ),
      { minLength: 1, maxLength: 40 },
    )
    .chain((rows) => fc.tuple(fc.constant(rows), fc.constantFrom('\n', '\r\n'), fc.boolean(), fc.boolean()))
    .map(([rows, end, trailingSeparator, lastNewline]) => {
      const separator = String.fromCharCode(plan.separator);
      const lines = rows.map((fields) => fields.map((field) => textOf(field, plan)).join(separator) + (trailingSeparator && fields.length > 0 ? separator : ''));
      return new TextEncoder().encode(lines.join(end) + (lastNewline ? end : ''));
    });

describe('CSV plain rows in WebAssembly', () => {
  const plans = [planOf(comma, dot, true, false), planOf(semicolon, comma, false, true), planOf(tab, dot, true, true), planOf(semicolon, dot, false, false)];

  it('gives the TypeScript parser\'s columns, lines and faults on random chunks, bit for bit', () => {
    const accelerator = counting(createWasmRowAccelerator(fields));
    for (const plan of plans) {
      fc.assert(
        fc.property(chunkOf(plan), (bytes) => {
          const reference = parseCsvChunk(bytes, plan);
          const fast = parseCsvChunk(bytes, plan, undefined, accelerator);
          if (isChunkFailure(reference)) {
            expect(fast).toEqual(reference);
            return;
          }
          expect(isChunkFailure(fast)).toBe(false);
          expectSameColumns(fast as CsvChunkColumns, reference);
        }),
        { numRuns: 1500 },
      );
    }
    // Most random rows are plain: the WebAssembly path took them (it is not merely deferring everything).
    expect(accelerator.taken).toBeGreaterThan(5000);
  });

  it('reads each plain number as Number() reads its text, 16 to 19 digits and 2^53 neighbours included', () => {
    const plan = planOf(comma, dot, true, false);
    const accelerator = counting(createWasmRowAccelerator(fields));
    const texts = ['9007199254740991', '9007199254740993', '18014398509481990', '9007199254740991.5', '0.20707218754349024', '-0.029855291802952332', '4.202285937663275', '0.000020149786892949773', '-0', '0.0', '1234567890123456789'];
    fc.assert(
      fc.property(fc.array(plainNumber.filter((text) => !text.startsWith('+')), { minLength: 5, maxLength: 5 }), fc.constantFrom(...texts), (row, special) => {
        row[2] = special;
        const bytes = new TextEncoder().encode(`${row.join(',')}\n`);
        const columns = parseCsvChunk(bytes, plan, undefined, accelerator) as CsvChunkColumns;
        const factors = [1e-3, 1, 10, 1, 0.5];
        const names = ['time', 'sync', 'ramp', 'gate', 'control'] as const;
        names.forEach((name, slot) => expect(Object.is(columns[name][0], Number(row[slot]) * factors[slot])).toBe(true));
      }),
      { numRuns: 5000 },
    );
    // Rows of 20 significant digits and more are left to the TypeScript parser; the rest went through WebAssembly.
    expect(accelerator.taken).toBeGreaterThan(1000);
  });

  it('is left out when the module was not built: the parser threads read in TypeScript', () => {
    expect(loadCsvFieldsModule(`${wasmPath}.absent`)).toBeNull();
  });
});
