/**
 * UTF-8 without TextEncoder/TextDecoder: the pure core compiles against ES2022 alone (ARCHITECTURE.md),
 * and these only touch headers, configuration lines and error messages, never the sample stream.
 */

/** Encodes a string; a lone surrogate becomes U+FFFD as the WHATWG encoder does. */
export function encodeUtf8(text: string): Uint8Array {
  const bytes = new Uint8Array(text.length * 3);
  let length = 0;
  for (let index = 0; index < text.length; index++) {
    let code = text.charCodeAt(index);
    if (code < 0x80) {
      bytes[length++] = code;
      continue;
    }
    if (code >= 0xd800 && code <= 0xdbff && index + 1 < text.length) {
      const low = text.charCodeAt(index + 1);
      if (low >= 0xdc00 && low <= 0xdfff) {
        code = 0x10000 + ((code - 0xd800) << 10) + (low - 0xdc00);
        index++;
      } else {
        code = 0xfffd;
      }
    } else if (code >= 0xd800 && code <= 0xdfff) {
      code = 0xfffd;
    }
    if (code < 0x800) {
      bytes[length++] = 0xc0 | (code >> 6);
      bytes[length++] = 0x80 | (code & 0x3f);
    } else if (code < 0x10000) {
      bytes[length++] = 0xe0 | (code >> 12);
      bytes[length++] = 0x80 | ((code >> 6) & 0x3f);
      bytes[length++] = 0x80 | (code & 0x3f);
    } else {
      bytes[length++] = 0xf0 | (code >> 18);
      bytes[length++] = 0x80 | ((code >> 12) & 0x3f);
      bytes[length++] = 0x80 | ((code >> 6) & 0x3f);
      bytes[length++] = 0x80 | (code & 0x3f);
    }
  }
  return bytes.slice(0, length);
}

/**
 * Decodes bytes as the WHATWG Encoding Standard's UTF-8 decoder does: each maximal ill-formed subsequence
 * becomes one U+FFFD, so any input yields a printable string.
 */
export function decodeUtf8(bytes: Uint8Array, start = 0, end = bytes.length): string {
  const codes: number[] = [];
  let needed = 0;
  let seen = 0;
  let codePoint = 0;
  let lower = 0x80;
  let upper = 0xbf;
  for (let index = start; index < end; index++) {
    const byte = bytes[index];
    if (needed === 0) {
      if (byte <= 0x7f) {
        codes.push(byte);
      } else if (byte >= 0xc2 && byte <= 0xdf) {
        needed = 1;
        codePoint = byte & 0x1f;
      } else if (byte >= 0xe0 && byte <= 0xef) {
        if (byte === 0xe0) lower = 0xa0;
        if (byte === 0xed) upper = 0x9f;
        needed = 2;
        codePoint = byte & 0x0f;
      } else if (byte >= 0xf0 && byte <= 0xf4) {
        if (byte === 0xf0) lower = 0x90;
        if (byte === 0xf4) upper = 0x8f;
        needed = 3;
        codePoint = byte & 0x07;
      } else {
        codes.push(0xfffd);
      }
      continue;
    }
    if (byte < lower || byte > upper) {
      codePoint = needed = seen = 0;
      lower = 0x80;
      upper = 0xbf;
      codes.push(0xfffd);
      index--; // the byte starts afresh
      continue;
    }
    lower = 0x80;
    upper = 0xbf;
    codePoint = (codePoint << 6) | (byte & 0x3f);
    seen++;
    if (seen === needed) {
      codes.push(codePoint);
      codePoint = needed = seen = 0;
    }
  }
  if (needed !== 0) codes.push(0xfffd);
  let text = '';
  for (let offset = 0; offset < codes.length; offset += 8192) {
    text += String.fromCodePoint(...codes.slice(offset, offset + 8192));
  }
  return text;
}

/** True when `bytes` starts with the UTF-8 byte order mark EF BB BF. */
export function startsWithByteOrderMark(bytes: Uint8Array, start = 0, end = bytes.length): boolean {
  return end - start >= 3 && bytes[start] === 0xef && bytes[start + 1] === 0xbb && bytes[start + 2] === 0xbf;
}
