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

/** Decodes bytes; malformed sequences become U+FFFD (one per bad byte), so any input yields a printable string. */
export function decodeUtf8(bytes: Uint8Array, start = 0, end = bytes.length): string {
  const codes: number[] = [];
  let index = start;
  while (index < end) {
    const first = bytes[index];
    if (first < 0x80) {
      codes.push(first);
      index++;
      continue;
    }
    const extra = first >= 0xf0 && first < 0xf5 ? 3 : first >= 0xe0 ? (first < 0xf0 ? 2 : -1) : first >= 0xc2 ? 1 : -1;
    if (extra < 0 || index + extra >= end) {
      codes.push(0xfffd);
      index++;
      continue;
    }
    let code = first & (0xff >> (extra + 2));
    let valid = true;
    for (let step = 1; step <= extra; step++) {
      const next = bytes[index + step];
      if ((next & 0xc0) !== 0x80) {
        valid = false;
        break;
      }
      code = (code << 6) | (next & 0x3f);
    }
    const minimum = extra === 1 ? 0x80 : extra === 2 ? 0x800 : 0x10000;
    if (!valid || code < minimum || code > 0x10ffff || (code >= 0xd800 && code <= 0xdfff)) {
      codes.push(0xfffd);
      index++;
      continue;
    }
    codes.push(code);
    index += extra + 1;
  }
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
