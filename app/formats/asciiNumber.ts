/**
 * Decimal numbers straight from bytes, without building a string per field: the sample stream of a CSV or
 * ASCII COMTRADE file is millions of fields. Up to 15 significant digits and a power of ten up to 1e22 the
 * result is one correctly rounded operation on exact operands (Clinger's fast path, "How to read floating
 * point numbers accurately", 1990), so it equals `Number(text)`; longer numbers fall back to `Number`.
 */

const exactPowersOfTen = Array.from({ length: 23 }, (_, exponent) => 10 ** exponent);

const space = 0x20;
const tab = 0x09;
const plus = 0x2b;
const minus = 0x2d;
const dot = 0x2e;
const zero = 0x30;
const nine = 0x39;

/** Where the last `scanAsciiNumber` stopped: the first byte after the number and its trailing spaces. */
export const scanState = { stop: 0 };

/**
 * Reads `[spaces][+|-]digits[.digits][(e|E)[+|-]digits][spaces]` starting at `start`, stopping at the first
 * byte that cannot continue it (a comma, say) or at `end`; `scanState.stop` says where. Returns NaN when no
 * digits were found. Parsing while scanning saves a separate pass to find the field's end.
 */
export function scanAsciiNumber(bytes: Uint8Array, start: number, end: number): number {
  let index = start;
  let code = index < end ? bytes[index] : -1;
  while (code === space || code === tab) code = ++index < end ? bytes[index] : -1;
  let negative = false;
  if (code === minus || code === plus) {
    negative = code === minus;
    code = ++index < end ? bytes[index] : -1;
  }
  let mantissa = 0;
  let significantDigits = 0;
  let decimalExponent = 0;
  let sawDigit = false;
  // Leading zeros are not significant.
  while (code === zero) {
    sawDigit = true;
    code = ++index < end ? bytes[index] : -1;
  }
  while (code >= zero && code <= nine) {
    sawDigit = true;
    if (significantDigits < 16) mantissa = mantissa * 10 + (code - zero);
    else decimalExponent++;
    significantDigits++;
    code = ++index < end ? bytes[index] : -1;
  }
  if (code === dot) {
    code = ++index < end ? bytes[index] : -1;
    if (mantissa === 0) {
      while (code === zero) {
        sawDigit = true;
        decimalExponent--;
        code = ++index < end ? bytes[index] : -1;
      }
    }
    while (code >= zero && code <= nine) {
      sawDigit = true;
      if (significantDigits < 16) {
        mantissa = mantissa * 10 + (code - zero);
        decimalExponent--;
      }
      significantDigits++;
      code = ++index < end ? bytes[index] : -1;
    }
  }
  if (!sawDigit) {
    scanState.stop = index;
    return Number.NaN;
  }
  if (code === 0x65 || code === 0x45) {
    code = ++index < end ? bytes[index] : -1;
    let exponentNegative = false;
    if (code === minus || code === plus) {
      exponentNegative = code === minus;
      code = ++index < end ? bytes[index] : -1;
    }
    let exponent = 0;
    let exponentDigits = 0;
    while (code >= zero && code <= nine) {
      if (exponent < 100000) exponent = exponent * 10 + (code - zero);
      exponentDigits++;
      code = ++index < end ? bytes[index] : -1;
    }
    if (exponentDigits === 0) {
      scanState.stop = index;
      return Number.NaN;
    }
    decimalExponent += exponentNegative ? -exponent : exponent;
  }
  const numberEnd = index;
  while (code === space || code === tab) code = ++index < end ? bytes[index] : -1;
  scanState.stop = index;
  if (mantissa === 0) return negative ? -0 : 0;
  if (significantDigits <= 15 && decimalExponent >= -22 && decimalExponent <= 22) {
    const magnitude = decimalExponent < 0 ? mantissa / exactPowersOfTen[-decimalExponent] : mantissa * exactPowersOfTen[decimalExponent];
    return negative ? -magnitude : magnitude;
  }
  // Validated above, so Number() sees a plain decimal and rounds it correctly.
  let text = '';
  for (let position = start; position < numberEnd; position++) text += String.fromCharCode(bytes[position]);
  return Number(text);
}

/**
 * Parses a whole field `bytes[start, end)` as a number (spaces around it allowed).
 * Returns NaN when the field is not such a number (check `isNotANumberText` to accept a literal NaN).
 */
export function parseAsciiNumber(bytes: Uint8Array, start: number, end: number): number {
  const value = scanAsciiNumber(bytes, start, end);
  return scanState.stop === end ? value : Number.NaN;
}

/** True for `NaN` in any letter case, with optional surrounding spaces: how our CSV writer marks a missing sample. */
export function isNotANumberText(bytes: Uint8Array, start: number, end: number): boolean {
  while (start < end && (bytes[start] === space || bytes[start] === tab)) start++;
  while (end > start && (bytes[end - 1] === space || bytes[end - 1] === tab)) end--;
  return end - start === 3 && (bytes[start] | 0x20) === 0x6e && (bytes[start + 1] | 0x20) === 0x61 && (bytes[start + 2] | 0x20) === 0x6e;
}

/** True when `bytes[start, end)` holds only spaces and tabs. */
export function isBlankText(bytes: Uint8Array, start: number, end: number): boolean {
  for (let index = start; index < end; index++) {
    if (bytes[index] !== space && bytes[index] !== tab) return false;
  }
  return true;
}

/** The field as text for an error message, cut to a readable length. */
export function fieldTextForMessage(bytes: Uint8Array, start: number, end: number): string {
  let text = '';
  for (let index = start; index < end && index < start + 40; index++) {
    const code = bytes[index];
    text += code >= 0x20 && code < 0x7f ? String.fromCharCode(code) : `\\x${code.toString(16).padStart(2, '0')}`;
  }
  return end - start > 40 ? `${text}...` : text;
}
