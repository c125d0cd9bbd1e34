/**
 * Decimal numbers straight from bytes, without building a string per field: the sample stream of a CSV or
 * ASCII COMTRADE file is millions of fields. Up to 15 significant digits and a power of ten up to 1e22 the
 * result is one correctly rounded operation on exact operands (Clinger's fast path, "How to read floating
 * point numbers accurately", 1990), so it equals `Number(text)`; so is any longer digit string whose whole integer is
 * below 2^53 (most of 16 digits). 16 to 19 significant digits (what a double's
 * shortest text needs, and what noisy samples print as) are multiplied out in double-double arithmetic (Dekker's
 * exact product and Knuth's exact sum, "A floating-point technique for extending the available precision", 1971),
 * about 104 bits, and rounded once; when that lands within 2^-30 ulp of a halfway point the rounding is left to
 * `Number`, as are numbers with more digits or larger exponents. So every result equals `Number(text)`.
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
 * `decimalMark` is the byte between the whole and the fractional digits: `.` (0x2e), or `,` (0x2c) for files
 * written with a decimal comma (their fields are then separated by semicolons or tabs). `tabIsBlank` false
 * for tab-separated files, where a tab ends the field instead of padding it.
 */
export function scanAsciiNumber(bytes: Uint8Array, start: number, end: number, decimalMark = dot, tabIsBlank = true): number {
  // A tab is blank around a number unless it separates the fields.
  const blank2 = tabIsBlank ? tab : space;
  let index = start;
  let code = index < end ? bytes[index] : -1;
  while (code === space || code === blank2) code = ++index < end ? bytes[index] : -1;
  let negative = false;
  if (code === minus || code === plus) {
    negative = code === minus;
    code = ++index < end ? bytes[index] : -1;
  }
  // The first 15 significant digits (exact in a double) and up to 4 more after them, also exact.
  let mantissa = 0;
  let tail = 0;
  let tailDigits = 0;
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
    if (significantDigits < 15) mantissa = mantissa * 10 + (code - zero);
    else if (significantDigits < 19) {
      tail = tail * 10 + (code - zero);
      tailDigits++;
    } else decimalExponent++;
    significantDigits++;
    code = ++index < end ? bytes[index] : -1;
  }
  if (code === decimalMark) {
    code = ++index < end ? bytes[index] : -1;
    if (significantDigits === 0) {
      while (code === zero) {
        sawDigit = true;
        decimalExponent--;
        code = ++index < end ? bytes[index] : -1;
      }
    }
    while (code >= zero && code <= nine) {
      sawDigit = true;
      if (significantDigits < 12 && index + 3 < end) {
        // Four digits a step where all fit in the first 15: a quarter of the multiply-adds in the longest loop.
        const second = bytes[index + 1] - zero;
        const third = bytes[index + 2] - zero;
        const fourth = bytes[index + 3] - zero;
        if (second >= 0 && second <= 9 && third >= 0 && third <= 9 && fourth >= 0 && fourth <= 9) {
          mantissa = mantissa * 10000 + ((code - zero) * 1000 + second * 100 + third * 10 + fourth);
          decimalExponent -= 4;
          significantDigits += 4;
          index += 4;
          code = index < end ? bytes[index] : -1;
          continue;
        }
      }
      if (significantDigits < 14) {
        // Two digits a step where both fit in the first 15: half the multiply-adds in the longest loop.
        const next = index + 1 < end ? bytes[index + 1] - zero : -1;
        if (next >= 0 && next <= 9) {
          mantissa = mantissa * 100 + ((code - zero) * 10 + next);
          decimalExponent -= 2;
          significantDigits += 2;
          index += 2;
          code = index < end ? bytes[index] : -1;
          continue;
        }
      }
      if (significantDigits < 15) {
        mantissa = mantissa * 10 + (code - zero);
        decimalExponent--;
      } else if (significantDigits < 19) {
        tail = tail * 10 + (code - zero);
        tailDigits++;
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
  while (code === space || code === blank2) code = ++index < end ? bytes[index] : -1;
  scanState.stop = index;
  if (mantissa === 0 && tail === 0) return negative ? -0 : 0;
  if (decimalExponent >= -22 && decimalExponent <= 22) {
    if (tailDigits === 0) {
      const magnitude = decimalExponent < 0 ? mantissa / exactPowersOfTen[-decimalExponent] : mantissa * exactPowersOfTen[decimalExponent];
      return negative ? -magnitude : magnitude;
    }
    if (significantDigits <= 19) {
      // The whole integer below 2^53 (most 16-digit numbers) is exact in a double: Clinger's one rounding again.
      // Rounding is monotonic, so a computed value under 2^53 means the exact one is under it too.
      const whole = mantissa * exactPowersOfTen[tailDigits] + tail;
      if (whole < 9007199254740992) {
        const magnitude = decimalExponent < 0 ? whole / exactPowersOfTen[-decimalExponent] : whole * exactPowersOfTen[decimalExponent];
        return negative ? -magnitude : magnitude;
      }
      const magnitude = longMantissaTimesPowerOfTen(mantissa, tail, tailDigits, decimalExponent);
      if (!Number.isNaN(magnitude)) return negative ? -magnitude : magnitude;
    }
  }
  // Validated above, so Number() sees a plain decimal and rounds it correctly.
  let text = '';
  for (let position = start; position < numberEnd; position++) {
    const byte = bytes[position];
    text += byte === decimalMark ? '.' : String.fromCharCode(byte);
  }
  return Number(text);
}

/** 2^27 + 1: splits a double into two halves of 26 bits whose products are exact (Veltkamp, via Dekker 1971). */
const splitter = 134217729;
/** The exact rounding error of the last twoProduct/twoSum. */
let lowPart = 0;

/** a x b rounded, with the exact error in lowPart (Dekker's product; no overflow for the magnitudes used here). */
function twoProduct(a: number, b: number): number {
  const product = a * b;
  const aSplit = splitter * a;
  const aHigh = aSplit - (aSplit - a);
  const aLow = a - aHigh;
  const bSplit = splitter * b;
  const bHigh = bSplit - (bSplit - b);
  const bLow = b - bHigh;
  lowPart = aHigh * bHigh - product + aHigh * bLow + aLow * bHigh + aLow * bLow;
  return product;
}

/** a + b rounded, with the exact error in lowPart (Knuth's sum). */
function twoSum(a: number, b: number): number {
  const sum = a + b;
  const bVirtual = sum - a;
  lowPart = a - (sum - bVirtual) + (b - bVirtual);
  return sum;
}

// A double's bits through typed arrays (the word order follows the platform's byte order, found once).
const floatBits = new Float64Array(1);
const wordBits = new Uint32Array(floatBits.buffer);
const highWord = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1 ? 1 : 0;

/** The spacing of doubles at a positive double of biased exponent above 52 (all that reach here). */
function ulpOf(value: number): number {
  floatBits[0] = value;
  const biasedExponent = (wordBits[highWord] >>> 20) & 0x7ff;
  wordBits[highWord] = (biasedExponent - 52) << 20;
  wordBits[1 - highWord] = 0;
  return floatBits[0];
}

/**
 * (mantissa x 10^tailDigits + tail) x 10^decimalExponent correctly rounded, or NaN when the double-double result
 * sits too near a halfway point to decide (the caller then asks Number). decimalExponent within +-22.
 */
function longMantissaTimesPowerOfTen(mantissa: number, tail: number, tailDigits: number, decimalExponent: number): number {
  // The integer of up to 19 digits as an unevaluated sum high + low, exact.
  let high = twoProduct(mantissa, exactPowersOfTen[tailDigits]);
  let low = lowPart;
  high = twoSum(high, tail);
  low += lowPart;
  const integerHigh = high + low;
  const integerLow = low - (integerHigh - high);
  // Times or divided by an exact power of ten, in double-double.
  const power = exactPowersOfTen[Math.abs(decimalExponent)];
  let resultHigh: number;
  let resultLow: number;
  if (decimalExponent >= 0) {
    resultHigh = twoProduct(integerHigh, power);
    resultLow = lowPart + integerLow * power;
  } else {
    resultHigh = integerHigh / power;
    const back = twoProduct(resultHigh, power);
    resultLow = (integerHigh - back - lowPart + integerLow) / power;
  }
  const rounded = resultHigh + resultLow;
  if (!(rounded > 0) || !Number.isFinite(rounded)) return Number.NaN;
  // What is left beyond the rounded double, against half its ulp: too close to the tie means undecided. Just under
  // a power of two the doubles are twice as dense, so the tie there is at a quarter ulp; both are checked.
  const beyond = Math.abs(resultHigh - rounded + resultLow);
  const halfUlp = ulpOf(rounded) / 2;
  const margin = halfUlp * 2 ** -30;
  return Math.abs(beyond - halfUlp) <= margin || Math.abs(beyond - halfUlp / 2) <= margin ? Number.NaN : rounded;
}

/**
 * Parses a whole field `bytes[start, end)` as a number (spaces around it allowed).
 * Returns NaN when the field is not such a number (check `isNotANumberText` to accept a literal NaN).
 */
export function parseAsciiNumber(bytes: Uint8Array, start: number, end: number, decimalMark = dot): number {
  const value = scanAsciiNumber(bytes, start, end, decimalMark);
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
