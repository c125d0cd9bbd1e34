/**
 * The plain rows of a long CSV capture in WebAssembly (AssemblyScript, compiled by scripts/build.mjs to
 * dist/csvFields.wasm): the same fast path as app/formats/csvChunk.ts and app/formats/asciiNumber.ts, twice as fast
 * per byte, for the parser threads of main/capture/parallelCsv.ts. It takes a line only when every field read is a
 * plain decimal (blanks, a sign, up to 19 significant digits, no exponent) that it can round exactly as
 * asciiNumber does (Clinger's fast path; Dekker and Knuth's double-double for 16 to 19 digits, with the same
 * halfway margin), and stops before any other line, which the TypeScript parser then reads with its own rules.
 * So the columns are the TypeScript parser's, bit for bit (tests/main/capture/csvFieldsWasm.test.ts checks it).
 * Memory is the caller's: input bytes, a slot per column (i8), five factors (f64) and five output columns (f64).
 */

const POW10: StaticArray<f64> = [1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];

let lowPart: f64 = 0;

@inline function twoProduct(a: f64, b: f64): f64 {
  const product = a * b;
  const aSplit = 134217729.0 * a;
  const aHigh = aSplit - (aSplit - a);
  const aLow = a - aHigh;
  const bSplit = 134217729.0 * b;
  const bHigh = bSplit - (bSplit - b);
  const bLow = b - bHigh;
  lowPart = aHigh * bHigh - product + aHigh * bLow + aLow * bHigh + aLow * bLow;
  return product;
}

@inline function twoSum(a: f64, b: f64): f64 {
  const sum = a + b;
  const bVirtual = sum - a;
  lowPart = a - (sum - bVirtual) + (b - bVirtual);
  return sum;
}

function ulpOf(value: f64): f64 {
  const bits = reinterpret<u64>(value);
  const biasedExponent = (bits >> 52) & 0x7ff;
  return reinterpret<f64>((biasedExponent - 52) << 52);
}

function longMantissa(mantissa: f64, tail: f64, tailDigits: i32, decimalExponent: i32): f64 {
  let high = twoProduct(mantissa, unchecked(POW10[tailDigits]));
  let low = lowPart;
  high = twoSum(high, tail);
  low += lowPart;
  const integerHigh = high + low;
  const integerLow = low - (integerHigh - high);
  const power = unchecked(POW10[decimalExponent < 0 ? -decimalExponent : decimalExponent]);
  let resultHigh: f64;
  let resultLow: f64;
  if (decimalExponent >= 0) {
    resultHigh = twoProduct(integerHigh, power);
    resultLow = lowPart + integerLow * power;
  } else {
    resultHigh = integerHigh / power;
    const back = twoProduct(resultHigh, power);
    resultLow = (integerHigh - back - lowPart + integerLow) / power;
  }
  const rounded = resultHigh + resultLow;
  if (!(rounded > 0) || !isFinite(rounded)) return NaN;
  const beyond = Math.abs(resultHigh - rounded + resultLow);
  const halfUlp = ulpOf(rounded) / 2;
  const margin = halfUlp * 9.313225746154785e-10; // 2^-30
  return Math.abs(beyond - halfUlp) <= margin || Math.abs(beyond - halfUlp / 2) <= margin ? NaN : rounded;
}

/** Where the last scanNumber stopped (after trailing blanks); a NaN result means: not a field this path takes. */
let numberStop: usize = 0;

@inline function isDigit(code: u32): bool {
  return code - 0x30 < 10;
}

function scanNumber(at: usize, end: usize, decimalMark: u32, blank2: u32): f64 {
  let index = at;
  let code: u32 = index < end ? load<u8>(index) : 0x100;
  while (code == 0x20 || code == blank2) code = ++index < end ? load<u8>(index) : 0x100;
  let negative = false;
  if (code == 0x2d || code == 0x2b) {
    negative = code == 0x2d;
    code = ++index < end ? load<u8>(index) : 0x100;
  }
  let mantissa: f64 = 0;
  let tail: f64 = 0;
  let tailDigits: i32 = 0;
  let significant: i32 = 0;
  let exponent: i32 = 0;
  let sawDigit = false;
  while (code == 0x30) {
    sawDigit = true;
    code = ++index < end ? load<u8>(index) : 0x100;
  }
  while (isDigit(code)) {
    sawDigit = true;
    if (significant < 15) mantissa = mantissa * 10 + <f64>(code - 0x30);
    else if (significant < 19) {
      tail = tail * 10 + <f64>(code - 0x30);
      tailDigits++;
    } else return NaN;
    significant++;
    code = ++index < end ? load<u8>(index) : 0x100;
  }
  if (code == decimalMark) {
    code = ++index < end ? load<u8>(index) : 0x100;
    if (significant == 0) {
      while (code == 0x30) {
        sawDigit = true;
        exponent--;
        code = ++index < end ? load<u8>(index) : 0x100;
      }
    }
    while (isDigit(code)) {
      sawDigit = true;
      if (significant < 15) {
        mantissa = mantissa * 10 + <f64>(code - 0x30);
        exponent--;
      } else if (significant < 19) {
        tail = tail * 10 + <f64>(code - 0x30);
        tailDigits++;
        exponent--;
      } else return NaN;
      significant++;
      code = ++index < end ? load<u8>(index) : 0x100;
    }
  }
  if (!sawDigit || code == 0x65 || code == 0x45) return NaN;
  while (code == 0x20 || code == blank2) code = ++index < end ? load<u8>(index) : 0x100;
  numberStop = index;
  if (mantissa == 0 && tail == 0) return negative ? -0.0 : 0.0;
  if (exponent < -22) return NaN;
  let magnitude: f64;
  if (tailDigits == 0) {
    magnitude = mantissa / unchecked(POW10[-exponent]);
  } else {
    const whole = mantissa * unchecked(POW10[tailDigits]) + tail;
    if (whole < 9007199254740992.0) magnitude = whole / unchecked(POW10[-exponent]);
    else {
      magnitude = longMantissa(mantissa, tail, tailDigits, exponent);
      if (isNaN(magnitude)) return NaN;
    }
  }
  return negative ? -magnitude : magnitude;
}

/** Where the last parseRows stopped: the end of the bytes, or the start of the first line it did not take. */
let stopOffset: i32 = 0;
export function stop(): i32 {
  return stopOffset;
}

/**
 * Parses whole rows of the fast form from bytes [input + start, input + length), up to `capacity` rows, into five
 * f64 columns at `out` (column c at out + c * capacity * 8). Stops before the first line it does not take.
 * `slots` at slotsAt: i8 per column; `factors` at factorsAt: 5 f64.
 */
export function parseRows(input: usize, start: i32, length: i32, columnCount: i32, slotsAt: usize, factorsAt: usize, separator: u32, decimalMark: u32, tabIsBlank: i32, out: usize, capacity: i32): i32 {
  const end = input + <usize>length;
  const blank2: u32 = tabIsBlank ? 0x09 : 0x20;
  let position = input + <usize>start;
  let rows: i32 = 0;
  const stride = <usize>capacity << 3;
  const f0 = load<f64>(factorsAt);
  const f1 = load<f64>(factorsAt, 8);
  const f2 = load<f64>(factorsAt, 16);
  const f3 = load<f64>(factorsAt, 24);
  const f4 = load<f64>(factorsAt, 32);
  while (position < end && rows < capacity) {
    let v0: f64 = NaN;
    let v1: f64 = 0;
    let v2: f64 = 0;
    let v3: f64 = 0;
    let v4: f64 = 0;
    let column: i32 = 0;
    let field = position;
    let rowEnd: usize = 0;
    let ok = true;
    while (true) {
      const slot: i32 = column < columnCount ? <i32>load<i8>(slotsAt + <usize>column) : -1;
      let fieldStop: usize;
      if (slot >= 0) {
        const value = scanNumber(field, end, decimalMark, blank2);
        if (!isFinite(value)) {
          ok = false;
          break;
        }
        fieldStop = numberStop;
        if (slot == 0) v0 = value * f0;
        else if (slot == 1) v1 = value * f1;
        else if (slot == 2) v2 = value * f2;
        else if (slot == 3) v3 = value * f3;
        else v4 = value * f4;
      } else if (column >= columnCount) {
        fieldStop = field;
        while (fieldStop < end) {
          const byte = <u32>load<u8>(fieldStop);
          if ((byte != 0x20 && byte != 0x09) || byte == separator) break;
          fieldStop++;
        }
      } else {
        fieldStop = field;
        while (fieldStop < end) {
          const byte = <u32>load<u8>(fieldStop);
          if (byte == separator || byte == 0x0a || byte == 0x0d) break;
          if (byte == 0x22) {
            ok = false;
            break;
          }
          fieldStop++;
        }
        if (!ok) break;
      }
      column++;
      if (fieldStop >= end) {
        rowEnd = end;
        break;
      }
      const byte = <u32>load<u8>(fieldStop);
      if (byte == separator) {
        field = fieldStop + 1;
        continue;
      }
      if (byte == 0x0a) {
        rowEnd = fieldStop;
        break;
      }
      if (byte == 0x0d && (fieldStop + 1 == end || load<u8>(fieldStop + 1) == 0x0a)) {
        rowEnd = fieldStop + 1 == end ? end : fieldStop + 1;
        break;
      }
      ok = false;
      break;
    }
    if (!ok || column < columnCount) break;
    const at = out + (<usize>rows << 3);
    store<f64>(at, v0);
    store<f64>(at + stride, v1);
    store<f64>(at + 2 * stride, v2);
    store<f64>(at + 3 * stride, v3);
    store<f64>(at + 4 * stride, v4);
    rows++;
    position = rowEnd + 1;
  }
  stopOffset = <i32>(position - input);
  return rows;
}

/** First byte free for the caller's buffers (after the static data). */
export function heapBase(): usize {
  return (__heap_base + 15) & ~15;
}
