/**
 * Numbers as technicians write part values: `4.7e-7`, `470n`, `0.47u`, `4k7`, `7.5k`, `2M2`, `200u`, `4R7`, `470R`
 * (SI prefixes p n u m k M G, and R for ohms; the letter may stand for the decimal point, as printed on parts:
 * the IEC 60062 letter-and-digit code, REFERENCES.md).
 * Returns NaN for anything else, so the caller can name the option in its error.
 */
const prefixScale: Record<string, number> = { p: 1e-12, n: 1e-9, u: 1e-6, µ: 1e-6, m: 1e-3, R: 1, r: 1, k: 1e3, K: 1e3, M: 1e6, G: 1e9 };

export function parseQuantity(text: string): number {
  const trimmed = text.trim().replace(/(ohm|Ω|F|V|A|Hz)$/i, '');
  if (/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(trimmed)) return Number(trimmed);
  const match = /^(\d+)?(?:\.(\d+))?([pnuµmRrkKMG])(\d*)$/.exec(trimmed);
  if (match === null) return Number.NaN;
  const [, whole = '', fraction = '', prefix, after] = match;
  // "R47", "n47": the letter leads, the digits after it are the fraction.
  if (whole === '' && fraction === '' && after === '') return Number.NaN;
  // "4k7": the prefix is the decimal point; "4.7k" has its own point and nothing after the prefix.
  if (fraction !== '' && after !== '') return Number.NaN;
  const digits = after !== '' ? `${whole}.${after}` : `${whole === '' ? '0' : whole}.${fraction === '' ? '0' : fraction}`;
  return Number(digits) * prefixScale[prefix];
}
