import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { base64Length, decodeBase64Into, encodeBase64 } from '../../../app/logger/base64';

describe('base64 (RFC 4648 section 4)', () => {
  it('encodes the RFC 4648 section 10 test vectors', () => {
    // RFC 4648, section 10 "Test Vectors".
    const vectors: Array<[string, string]> = [
      ['', ''],
      ['f', 'Zg=='],
      ['fo', 'Zm8='],
      ['foo', 'Zm9v'],
      ['foob', 'Zm9vYg=='],
      ['fooba', 'Zm9vYmE='],
      ['foobar', 'Zm9vYmFy'],
    ];
    for (const [plain, encoded] of vectors) {
      const bytes = Uint8Array.from(plain, (character) => character.charCodeAt(0));
      expect(encodeBase64(bytes)).toBe(encoded);
      const decoded = new Uint8Array(bytes.length);
      expect(decodeBase64Into(encoded, 0, encoded.length, bytes.length, decoded)).toBe(true);
      expect([...decoded]).toEqual([...bytes]);
    }
  });

  it('agrees with Node (an independent implementation) both ways on any bytes', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 600 }), (bytes) => {
        const text = encodeBase64(bytes);
        expect(text).toBe(Buffer.from(bytes).toString('base64'));
        expect(text.length).toBe(base64Length(bytes.length));
        const decoded = new Uint8Array(bytes.length);
        expect(decodeBase64Into(`xx${text}yy`, 2, 2 + text.length, bytes.length, decoded)).toBe(true);
        expect([...decoded]).toEqual([...bytes]);
      }),
    );
  });

  it('rejects text of the wrong length, outside the alphabet or with non-canonical padding', () => {
    const into = new Uint8Array(8);
    expect(decodeBase64Into('Zm9v', 0, 4, 2, into)).toBe(false); // 3 bytes' worth, 2 asked
    expect(decodeBase64Into('Zm9*', 0, 4, 3, into)).toBe(false);
    expect(decodeBase64Into('Zm é', 0, 4, 3, into)).toBe(false);
    expect(decodeBase64Into('Zh==', 0, 4, 1, into)).toBe(false); // low bits set: not what any encoder writes
    expect(decodeBase64Into('Zm8x', 0, 4, 2, into)).toBe(false); // padding missing
  });
});
