/** Values as a technician reads them on a part or a meter: 7.5 kohm, 470 nF, 6.02 V. */

function trimmed(value: number, digits: number): string {
  return Number(value.toPrecision(digits)).toString();
}

export function formatOhm(ohm: number): string {
  if (ohm >= 1e6) return `${trimmed(ohm / 1e6, 3)} Mohm`;
  if (ohm >= 1e3) return `${trimmed(ohm / 1e3, 3)} kohm`;
  return `${trimmed(ohm, 3)} ohm`;
}

export function formatFarad(farad: number): string {
  if (farad >= 1e-6) return `${trimmed(farad * 1e6, 3)} uF`;
  if (farad >= 1e-9) return `${trimmed(farad * 1e9, 3)} nF`;
  return `${trimmed(farad * 1e12, 3)} pF`;
}

export function formatVolt(volt: number): string {
  return `${volt.toFixed(2)} V`;
}

export function formatPercent(percent: number): string {
  return `${percent >= 0 ? '+' : ''}${percent.toFixed(1)} %`;
}
