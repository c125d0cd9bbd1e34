/**
 * Readings with SI prefixes (the SI Brochure's decimal prefixes, p to G), so a value is read without counting
 * zeros: 0.00047 F shows as "470 µF", 7.5 V per ms as "7.5 V/ms". Significant digits are fixed, trailing zeros dropped.
 * Part values (resistances, the ramp capacitor) are not shown with it: they use the drawing code of
 * app/board/formatValues.ts ("7k5"), one notation everywhere.
 * DOM-free so it is unit-tested in Node.
 */
import { formatOhm } from '../../app/board/formatValues';

const prefixes: readonly { exponent: number; symbol: string }[] = [
  { exponent: 9, symbol: 'G' },
  { exponent: 6, symbol: 'M' },
  { exponent: 3, symbol: 'k' },
  { exponent: 0, symbol: '' },
  { exponent: -3, symbol: 'm' },
  { exponent: -6, symbol: 'µ' },
  { exponent: -9, symbol: 'n' },
  { exponent: -12, symbol: 'p' },
];

export interface FormatSiOptions {
  /** Significant digits shown (default 3). */
  digits?: number;
  /** Text for a missing value (default an en dash). */
  missing?: string;
  /** Keep trailing zeros, for readings whose resolution is part of the answer ("50.00 Hz"). */
  keepZeros?: boolean;
}

/** `value` in base units (V, A, s, Hz, Ω, F) as "number prefix+unit". */
export function formatSi(value: number | null | undefined, unit: string, options: FormatSiOptions = {}): string {
  const digits = options.digits ?? 3;
  if (value === null || value === undefined || !Number.isFinite(value)) return options.missing ?? '–';
  if (value === 0) return `0 ${unit}`;
  const magnitude = Math.abs(value);
  let chosen = prefixes[prefixes.length - 1];
  for (const prefix of prefixes) {
    if (magnitude >= 10 ** prefix.exponent * (1 - 5e-13)) {
      chosen = prefix;
      break;
    }
  }
  const shape = (number: number): string => (options.keepZeros ? plainDigits(number.toPrecision(digits)) : trimZeros(number.toPrecision(digits)));
  let scaled = value / 10 ** chosen.exponent;
  let text = shape(scaled);
  // Rounding can carry into the next prefix: 999.96 V at 3 digits is 1.00 kV, not "1000 V".
  if (Math.abs(Number(text)) >= 1000 && chosen.exponent < 9) {
    const larger = prefixes[prefixes.indexOf(chosen) - 1];
    scaled = value / 10 ** larger.exponent;
    text = shape(scaled);
    chosen = larger;
  }
  return `${text} ${chosen.symbol}${unit}`;
}

/** Plain fixed-point number with a unit, for degrees and percentages (no prefixes: "12.5°", "2.1 %"). */
export function formatFixed(value: number | null | undefined, unit: string, decimals = 1, missing = '–'): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return missing;
  const text = value.toFixed(decimals);
  const cleaned = text === `-${(0).toFixed(decimals)}` ? text.slice(1) : text;
  return unit === '°' ? `${cleaned}°` : `${cleaned} ${unit}`;
}

/** toPrecision's text without exponent form, zeros kept ("5.000e+1" -> "50.00"). */
function plainDigits(text: string): string {
  if (!text.includes('e')) return text;
  const [mantissa, exponentText] = text.split('e');
  const decimals = Math.max(0, (mantissa.split('.')[1]?.length ?? 0) - Number(exponentText));
  return Number(text).toFixed(decimals);
}

/** toPrecision's text without trailing zeros and without exponent form ("3.3e+2" -> "330"). */
function trimZeros(text: string): string {
  if (text.includes('e')) return String(Number(text));
  return text.includes('.') ? text.replace(/0+$/, '').replace(/\.$/, '') : text;
}

/**
 * A contract reading's value in its unit as shown on screen. The contract carries the unit symbol the value is in
 * ("V", "Hz", "deg", "us", "ms", "V/ms", "%", "" for counts); scaled units are brought back to base units first
 * so the prefix is chosen once, in one place.
 */
export function formatReading(value: number | null | undefined, unit: string, digits = 3): string {
  switch (unit) {
    case 'deg':
      return formatFixed(value, '°', 1);
    case '%':
      return formatFixed(value, '%', 1);
    case 'us':
      // Zero keeps the unit it was asked in ("0 µs"), not the bare "0 s" the prefix rule would give.
      return value === 0 ? '0 µs' : formatSi(value == null ? value : value * 1e-6, 's', { digits });
    case 'ms':
      return formatSi(value == null ? value : value * 1e-3, 's', { digits });
    case 'ohm':
      // A resistance is a part value: the one notation of app/board/formatValues.ts (IEC 60062 code, "7k5").
      return value == null || !Number.isFinite(value) ? '–' : formatOhm(value, digits);
    case 'deg/V':
      // Degrees are not an SI unit: no prefixes ("0.61°/V", never "605 mdeg/V").
      return value == null || !Number.isFinite(value) ? '–' : `${formatFixed(value, '°', 2)}/V`;
    case 'Hz':
      // Mains drift is read in hundredths of a hertz: 50.02 Hz, not 50 Hz.
      return formatSi(value, 'Hz', { digits: Math.max(digits, 4), keepZeros: true });
    case '':
      return value == null || !Number.isFinite(value) ? '–' : String(Math.round(value));
    default:
      return formatSi(value, unit, { digits });
  }
}
