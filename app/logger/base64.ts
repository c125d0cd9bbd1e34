/**
 * Base64 with the standard alphabet and `=` padding (RFC 4648 section 4). Written here because the pure core has
 * neither Buffer nor atob; the decoder is table-driven because it runs on every data line (about 250 a second).
 */
const alphabet = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';
const decodeTable = buildDecodeTable();

function buildDecodeTable(): Int16Array {
  const entries = new Int16Array(128).fill(-1);
  for (let index = 0; index < alphabet.length; index++) entries[alphabet.charCodeAt(index)] = index;
  return entries;
}

/** Number of base64 characters (with padding) that carry `byteCount` bytes. */
export function base64Length(byteCount: number): number {
  return Math.ceil(byteCount / 3) * 4;
}

export function encodeBase64(bytes: Uint8Array): string {
  let text = '';
  let index = 0;
  for (; index + 2 < bytes.length; index += 3) {
    const triple = (bytes[index] << 16) | (bytes[index + 1] << 8) | bytes[index + 2];
    text += alphabet[triple >> 18] + alphabet[(triple >> 12) & 63] + alphabet[(triple >> 6) & 63] + alphabet[triple & 63];
  }
  const rest = bytes.length - index;
  if (rest === 1) {
    const triple = bytes[index] << 16;
    text += alphabet[triple >> 18] + alphabet[(triple >> 12) & 63] + '==';
  } else if (rest === 2) {
    const triple = (bytes[index] << 16) | (bytes[index + 1] << 8);
    text += alphabet[triple >> 18] + alphabet[(triple >> 12) & 63] + alphabet[(triple >> 6) & 63] + '=';
  }
  return text;
}

function sextet(text: string, index: number): number {
  const code = text.charCodeAt(index);
  return code < 128 ? decodeTable[code] : -1;
}

/**
 * Decodes `text[start..end)` into exactly `byteCount` bytes written to `into`. Returns false (and leaves `into`
 * partly written) when the text is not canonical base64 of that many bytes: wrong length, a character outside the
 * alphabet, wrong padding.
 */
export function decodeBase64Into(text: string, start: number, end: number, byteCount: number, into: Uint8Array): boolean {
  if (end - start !== base64Length(byteCount) || into.length < byteCount) return false;
  const fullGroups = Math.floor(byteCount / 3);
  let out = 0;
  let at = start;
  for (let group = 0; group < fullGroups; group++, at += 4) {
    const a = sextet(text, at);
    const b = sextet(text, at + 1);
    const c = sextet(text, at + 2);
    const d = sextet(text, at + 3);
    if ((a | b | c | d) < 0) return false;
    const triple = (a << 18) | (b << 12) | (c << 6) | d;
    into[out++] = triple >> 16;
    into[out++] = (triple >> 8) & 0xff;
    into[out++] = triple & 0xff;
  }
  const rest = byteCount - fullGroups * 3;
  if (rest === 0) return true;
  const a = sextet(text, at);
  const b = sextet(text, at + 1);
  if ((a | b) < 0) return false;
  if (rest === 1) {
    if (text[at + 2] !== '=' || text[at + 3] !== '=' || (b & 15) !== 0) return false;
    into[out] = (a << 2) | (b >> 4);
    return true;
  }
  const c = sextet(text, at + 2);
  if (c < 0 || text[at + 3] !== '=' || (c & 3) !== 0) return false;
  into[out++] = (a << 2) | (b >> 4);
  into[out] = ((b & 15) << 4) | (c >> 2);
  return true;
}
