import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { decodeUtf8, encodeUtf8 } from '../../../app/formats/utf8';

// Outside reference: the WHATWG Encoding Standard as implemented by Node's TextEncoder/TextDecoder.
describe('utf8', () => {
  it('encodes exactly as TextEncoder, lone surrogates included', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'binary', maxLength: 40 }), (text) => {
        expect([...encodeUtf8(text)]).toEqual([...new TextEncoder().encode(text)]);
      }),
      { numRuns: 2000 },
    );
  });

  it('decodes well-formed text back to the same string', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'grapheme', maxLength: 40 }), (text) => {
        expect(decodeUtf8(encodeUtf8(text))).toBe(text);
      }),
    );
  });

  it('decodes arbitrary bytes without throwing, as TextDecoder with replacement does', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 40 }), (bytes) => {
        expect(decodeUtf8(bytes)).toBe(new TextDecoder('utf-8').decode(bytes));
      }),
      { numRuns: 2000 },
    );
  });
});
