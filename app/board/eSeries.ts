/**
 * Preferred values, IEC 60063 (REFERENCES.md). The tables are written out: E6-E24 are older than the formula
 * round(10^(i/n)) and differ from it (E24: 27 30 33 36 39 43 47 82), and E192 has one exception (920 for 919).
 * A value is matched to the series by ratio (log distance), the way the series are spaced.
 */
export type ESeriesName = 'E6' | 'E12' | 'E24' | 'E48' | 'E96' | 'E192';

export const eSeriesNames: readonly ESeriesName[] = ['E6', 'E12', 'E24', 'E48', 'E96', 'E192'];

const e6 = [10, 15, 22, 33, 47, 68];
const e12 = [10, 12, 15, 18, 22, 27, 33, 39, 47, 56, 68, 82];
const e24 = [10, 11, 12, 13, 15, 16, 18, 20, 22, 24, 27, 30, 33, 36, 39, 43, 47, 51, 56, 62, 68, 75, 82, 91];
const e96 = [
  100, 102, 105, 107, 110, 113, 115, 118, 121, 124, 127, 130, 133, 137, 140, 143, 147, 150, 154, 158, 162, 165, 169, 174,
  178, 182, 187, 191, 196, 200, 205, 210, 215, 221, 226, 232, 237, 243, 249, 255, 261, 267, 274, 280, 287, 294, 301, 309,
  316, 324, 332, 340, 348, 357, 365, 374, 383, 392, 402, 412, 422, 432, 442, 453, 464, 475, 487, 499, 511, 523, 536, 549,
  562, 576, 590, 604, 619, 634, 649, 665, 681, 698, 715, 732, 750, 768, 787, 806, 825, 845, 866, 887, 909, 931, 953, 976,
];
const e48 = [
  100, 105, 110, 115, 121, 127, 133, 140, 147, 154, 162, 169, 178, 187, 196, 205, 215, 226, 237, 249, 261, 274, 287, 301,
  316, 332, 348, 365, 383, 402, 422, 442, 464, 487, 511, 536, 562, 590, 619, 649, 681, 715, 750, 787, 825, 866, 909, 953,
];
const e192 = [
  100, 101, 102, 104, 105, 106, 107, 109, 110, 111, 113, 114, 115, 117, 118, 120, 121, 123, 124, 126, 127, 129, 130, 132,
  133, 135, 137, 138, 140, 142, 143, 145, 147, 149, 150, 152, 154, 156, 158, 160, 162, 164, 165, 167, 169, 172, 174, 176,
  178, 180, 182, 184, 187, 189, 191, 193, 196, 198, 200, 203, 205, 208, 210, 213, 215, 218, 221, 223, 226, 229, 232, 234,
  237, 240, 243, 246, 249, 252, 255, 258, 261, 264, 267, 271, 274, 277, 280, 284, 287, 291, 294, 298, 301, 305, 309, 312,
  316, 320, 324, 328, 332, 336, 340, 344, 348, 352, 357, 361, 365, 370, 374, 379, 383, 388, 392, 397, 402, 407, 412, 417,
  422, 427, 432, 437, 442, 448, 453, 459, 464, 470, 475, 481, 487, 493, 499, 505, 511, 517, 523, 530, 536, 542, 549, 556,
  562, 569, 576, 583, 590, 597, 604, 612, 619, 626, 634, 642, 649, 657, 665, 673, 681, 690, 698, 706, 715, 723, 732, 741,
  750, 759, 768, 777, 787, 796, 806, 816, 825, 835, 845, 856, 866, 876, 887, 898, 909, 920, 931, 942, 953, 965, 976, 988,
];

/** Each series' significant figures within one decade, as IEC 60063 prints them. */
export const eSeriesTables: Readonly<Record<ESeriesName, readonly number[]>> = { E6: e6, E12: e12, E24: e24, E48: e48, E96: e96, E192: e192 };

/** Usual tolerance of parts sold in each series (REFERENCES.md: E6 20 %, E12 10 %, E24 5 %, E48 2 %, E96 1 %; E192 0.5 % from memory). */
export const eSeriesTolerancePct: Readonly<Record<ESeriesName, number>> = { E6: 20, E12: 10, E24: 5, E48: 2, E96: 1, E192: 0.5 };

/** Significant figures of a series scaled into [1, 10). */
function unitMantissas(series: ESeriesName): number[] {
  const table = eSeriesTables[series];
  const scale = table[0];
  return table.map((figure) => figure / scale);
}

function clean(value: number): number {
  return Number(value.toPrecision(4));
}

/** The standard values of a series around `value`: the greatest at or below and the least at or above it. */
export function standardValueNeighbours(value: number, series: ESeriesName): { below: number; above: number } {
  if (!(value > 0) || !Number.isFinite(value)) throw new RangeError(`standardValueNeighbours: value must be a positive finite number, got ${value}`);
  const mantissas = unitMantissas(series);
  let decade = Math.floor(Math.log10(value));
  // Guard against log10 rounding at exact decade boundaries (log10(1000) may come out as 2.9999999999999996).
  if (10 ** (decade + 1) <= value * (1 + 1e-12)) decade += 1;
  const power = 10 ** decade;
  const candidates = [...mantissas.map((mantissa) => clean(mantissa * power)), clean(10 * power)];
  const previous = clean(mantissas[mantissas.length - 1] * (power / 10));
  let below = previous;
  let above = candidates[candidates.length - 1];
  for (const candidate of candidates) {
    if (candidate <= value * (1 + 1e-12)) below = candidate;
    if (candidate >= value * (1 - 1e-12)) {
      above = candidate;
      break;
    }
  }
  return { below, above };
}

/** Nearest standard value by ratio (log distance), in any decade. A tie goes to the larger value. */
export function nearestStandardValue(value: number, series: ESeriesName): number {
  const { below, above } = standardValueNeighbours(value, series);
  return Math.log(value / below) < Math.log(above / value) ? below : above;
}

/** All standard values from `low` to `high` inclusive, ascending. */
export function standardValuesBetween(low: number, high: number, series: ESeriesName): number[] {
  if (!(low > 0) || !(high >= low)) return [];
  const values: number[] = [];
  let current = standardValueNeighbours(low, series).above;
  while (current <= high * (1 + 1e-12)) {
    values.push(current);
    current = standardValueNeighbours(current * (1 + 1e-9), series).above;
  }
  return values;
}

/** Whether `value` is itself a standard value of the series (to four significant figures). */
export function isStandardValue(value: number, series: ESeriesName): boolean {
  return nearestStandardValue(value, series) === clean(value);
}
