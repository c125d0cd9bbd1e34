/**
 * Part values in one notation everywhere a person reads them (Board, Trim and Logbook screens, command line text,
 * records in HTML and PDF): the IEC 60062 letter-and-digit code printed on drawings and parts, where the
 * multiplier letter stands for the decimal point (REFERENCES.md): 6k8 = 6.8 kohm, 4R7 = 4.7 ohm, 1M5, 390n = 390 nF,
 * 4u7, 220p, and a single digit keeps its zero: 3k0, 1u0. ASCII only ("u" for micro, as parts are marked when the font has no mu), so every output carries it.
 * Readings that are not part values keep SI with units (7.30 V, +1.2 %).
 */

const resistorLetters: readonly { scale: number; letter: string }[] = [
  { scale: 1e9, letter: 'G' },
  { scale: 1e6, letter: 'M' },
  { scale: 1e3, letter: 'k' },
  { scale: 1, letter: 'R' },
];

const capacitorLetters: readonly { scale: number; letter: string }[] = [
  { scale: 1e-3, letter: 'm' },
  { scale: 1e-6, letter: 'u' },
  { scale: 1e-9, letter: 'n' },
  { scale: 1e-12, letter: 'p' },
];

/** "6.8" -> "6k8", "470" -> "470k", "0.47" (below the smallest letter) -> "R47". */
function letterCode(value: number, letters: readonly { scale: number; letter: string }[], digits: number): string {
  if (!Number.isFinite(value)) return String(value);
  if (value === 0) return `0${letters[letters.length - 1].letter}`;
  const sign = value < 0 ? '-' : '';
  const magnitude = Math.abs(value);
  let index = letters.findIndex((entry) => magnitude >= entry.scale * (1 - 5e-13));
  if (index < 0) index = letters.length - 1;
  let mantissa = Number((magnitude / letters[index].scale).toPrecision(digits));
  // Rounding can carry into the next letter: 999.6 at three digits is 1k0, not 1000R.
  if (mantissa >= 1000 && index > 0) {
    index -= 1;
    mantissa = Number((magnitude / letters[index].scale).toPrecision(digits));
  }
  const text = mantissa.toString();
  const [whole, fraction] = text.split('.');
  const letter = letters[index].letter;
  // Two significant digits at least, as the code's own table writes them (1R0, 1k0, 1M0, 1u0; from memory of
  // IEC 60062): "3k" is read as a value cut short, "3k0" as three kilohm exactly.
  if (fraction === undefined) return `${sign}${whole}${letter}${whole.length === 1 ? '0' : ''}`;
  return `${sign}${whole === '0' ? '' : whole}${letter}${fraction}`;
}

/** A resistance as marked: 6k8, 470R, 4R7, 1M5 (three significant digits; `digits` for more). */
export function formatOhm(ohm: number, digits = 3): string {
  return letterCode(ohm, resistorLetters, digits);
}

/** A capacitance as marked: 390n, 4u7, 220p (three significant digits; `digits` for more). */
export function formatFarad(farad: number, digits = 3): string {
  return letterCode(farad, capacitorLetters, digits);
}

/** A part's value in its own unit: farad for the ramp capacitor, ohm for every other position. */
export function formatPartValue(part: string, value: number, digits = 3): string {
  return part === 'cRamp' ? formatFarad(value, digits) : formatOhm(value, digits);
}

export function formatVolt(volt: number): string {
  return `${volt.toFixed(2)} V`;
}

export function formatPercent(percent: number): string {
  return `${percent >= 0 ? '+' : ''}${percent.toFixed(1)} %`;
}
