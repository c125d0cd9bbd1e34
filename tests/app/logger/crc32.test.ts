import { crc32 as nodeCrc32 } from 'node:zlib';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { crc32, crc32OfText, crcToHex } from '../../../app/logger/crc32';

describe('CRC-32/ISO-HDLC', () => {
  it('gives the published check value for "123456789"', () => {
    // CRC RevEng catalogue, CRC-32/ISO-HDLC: check = 0xCBF43926.
    expect(crc32OfText('123456789')).toBe(0xcbf43926);
    expect(crc32(Uint8Array.from('123456789', (character) => character.charCodeAt(0)))).toBe(0xcbf43926);
    expect(crcToHex(crc32OfText('123456789'))).toBe('CBF43926');
  });

  it('gives 0 for no bytes (init and final XOR cancel, CRC RevEng catalogue parameters)', () => {
    expect(crc32(new Uint8Array(0))).toBe(0);
  });

  it('agrees with zlib (an independent implementation of the same CRC) on any bytes', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 2000 }), (bytes) => {
        expect(crc32(bytes)).toBe(nodeCrc32(bytes));
      }),
    );
  });

  it('reads the bytes of an ASCII string the same way zlib does, for any part of it', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'binary-ascii', maxLength: 300 }), fc.nat(), fc.nat(), (text, a, b) => {
        const start = Math.min(a, b) % (text.length + 1);
        const end = Math.max(start, Math.max(a, b) % (text.length + 1));
        const part = text.slice(start, end);
        expect(crc32OfText(text, start, end)).toBe(nodeCrc32(Buffer.from(part, 'latin1')));
      }),
    );
  });
});
