/**
 * Line framing shared by every line in both directions: `<body>*<CRC>` where CRC is CRC-32/ISO-HDLC of the body's
 * bytes written as 8 hexadecimal digits (upper case when sending; either case accepted).
 */
import { crc32OfText, crcToHex } from './crc32';

export function frameLine(body: string): string {
  return `${body}*${crcToHex(crc32OfText(body))}`;
}

export type UnframeResult = { ok: true; bodyEnd: number } | { ok: false; reason: 'no-crc' | 'crc' };

function hexValue(code: number): number {
  if (code >= 48 && code <= 57) return code - 48;
  if (code >= 65 && code <= 70) return code - 55;
  if (code >= 97 && code <= 102) return code - 87;
  return -1;
}

/** Parses 8 hex digits at `text[start..start+8)`; -1 when they are not hex. */
export function parseHex32(text: string, start: number): number {
  let value = 0;
  for (let index = start; index < start + 8; index++) {
    const digit = hexValue(text.charCodeAt(index));
    if (digit < 0) return -1;
    value = value * 16 + digit;
  }
  return value;
}

/**
 * Checks the frame of `line` (terminator already removed). The CRC follows the last `*`, so a body may hold `*`.
 * `bodyEnd` is the index of that `*`.
 */
export function unframeLine(line: string): UnframeResult {
  const star = line.length - 9;
  if (star < 0 || line.charCodeAt(star) !== 42) return { ok: false, reason: 'no-crc' };
  const sent = parseHex32(line, star + 1);
  if (sent < 0) return { ok: false, reason: 'no-crc' };
  return sent === crc32OfText(line, 0, star) ? { ok: true, bodyEnd: star } : { ok: false, reason: 'crc' };
}

/** Strips one trailing CR (lines may end CR LF). */
export function withoutCarriageReturn(line: string): string {
  return line.length > 0 && line.charCodeAt(line.length - 1) === 13 ? line.slice(0, -1) : line;
}
