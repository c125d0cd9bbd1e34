/** Intel HEX images: the bytes where the records put them, and a damaged file named by its line. */
import { describe, expect, it } from 'vitest';
import { isInputError } from '../../../app/errors';
import { parseIntelHex } from '../../../main/firmware/intelHex';
import { inputErrorOf } from '../../helpers/inputError';

/** One record with its checksum: the two's complement of the byte sum (Intel HEX). */
function record(type: number, address: number, data: number[]): string {
  const bytes = [data.length, address >> 8, address & 0xff, type, ...data];
  const sum = bytes.reduce((total, byte) => total + byte, 0);
  return `:${[...bytes, (0x100 - (sum & 0xff)) & 0xff].map((byte) => byte.toString(16).toUpperCase().padStart(2, '0')).join('')}`;
}

describe('Intel HEX', () => {
  it('places data records at their addresses, with extended linear addresses', () => {
    const text = [record(0, 0x0000, [0x0c, 0x94, 0x34, 0x00]), record(0, 0x0010, [0xaa]), record(4, 0, [0x00, 0x00]), record(0, 0x0020, [0x55]), record(1, 0, [])].join('\r\n');
    const flash = parseIntelHex(text, 64);
    expect([...flash.subarray(0, 4)]).toEqual([0x0c, 0x94, 0x34, 0x00]);
    expect(flash[0x10]).toBe(0xaa);
    expect(flash[0x20]).toBe(0x55);
    // The well-known end-of-file record, written out.
    expect(record(1, 0, [])).toBe(':00000001FF');
  });

  it.each([
    [`${record(0, 0, [1, 2])}\n:0400000001020304F0\n:00000001FF`, /image\.hex, line 2: fails its checksum/],
    [`${record(0, 0, [1, 2])}\n`, /image\.hex: has no end-of-file record/],
    [`${record(0, 60, [1, 2, 3, 4, 5])}\n:00000001FF`, /line 1: writes past the end of the 64-byte flash/],
    ['hello\n:00000001FF', /line 1: is not an Intel HEX record/],
    [':00000001FF', /holds no program bytes/],
    [`${record(7, 0, [])}\n:00000001FF`, /line 1: has record type 7/],
  ])('refuses a damaged image with the line named', (text, message) => {
    const error = inputErrorOf(() => parseIntelHex(text, 64, 'image.hex'));
    expect(isInputError(error)).toBe(true);
    expect(error.message).toMatch(message);
  });
});
