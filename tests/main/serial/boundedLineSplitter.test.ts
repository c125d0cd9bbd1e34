import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createBoundedLineSplitter } from '../../../main/serial/boundedLineSplitter';

/** The plain model: whole text split at LF, a CR before the LF removed, lines over the cap cut and flagged. */
function model(bytes: Uint8Array, cap: number): { lines: Array<[string, boolean]>; longLines: number[] } {
  const lines: Array<[string, boolean]> = [];
  const longLines: number[] = [];
  let start = 0;
  for (let i = 0; i < bytes.length; i += 1) {
    if (bytes[i] !== 10) continue;
    const line = bytes.subarray(start, i);
    if (line.length > cap) {
      lines.push([new TextDecoder().decode(line.subarray(0, cap)), true]);
      longLines.push(line.length);
    } else {
      const end = line.length > 0 && line[line.length - 1] === 13 ? line.length - 1 : line.length;
      lines.push([new TextDecoder().decode(line.subarray(0, end)), false]);
    }
    start = i + 1;
  }
  const rest = bytes.subarray(start);
  if (rest.length > cap) lines.push([new TextDecoder().decode(rest.subarray(0, cap)), true]);
  return { lines, longLines };
}

describe('bounded line splitter', () => {
  it('splits any bytes cut into any chunks like the plain model, and never holds more than the cap', () => {
    const byte = fc.oneof(fc.constantFrom(10, 13, 65, 0xc3, 0xa9), fc.integer({ min: 0, max: 255 }));
    fc.assert(
      fc.property(fc.array(byte, { maxLength: 400 }), fc.array(fc.integer({ min: 1, max: 50 }), { minLength: 1, maxLength: 20 }), fc.integer({ min: 1, max: 40 }), (values, cuts, cap) => {
        const bytes = Uint8Array.from(values);
        const splitter = createBoundedLineSplitter(cap);
        const lines: Array<[string, boolean]> = [];
        const longLines: number[] = [];
        let offset = 0;
        let cut = 0;
        while (offset < bytes.length) {
          const size = cuts[cut % cuts.length];
          cut += 1;
          splitter.push(bytes.subarray(offset, offset + size), (line) => lines.push([line.text, line.truncated]), (line) => longLines.push(line.bytes));
          expect(splitter.pendingBytes()).toBeLessThanOrEqual(cap);
          offset += size;
        }
        // UTF-8 sequences split across chunk boundaries of the model and the splitter are decoded the same way,
        // because both decode each whole (cut) line at once.
        expect({ lines, longLines }).toEqual(model(bytes, cap));
      }),
      { numRuns: 300 },
    );
  });

  it('refuses a cap that is not a whole number above 0', () => {
    expect(() => createBoundedLineSplitter(0)).toThrow(RangeError);
    expect(() => createBoundedLineSplitter(2.5)).toThrow(RangeError);
  });
});
