/** A session's recorded readings as CSV: one row per reading with its step, unit, design values and verdict. DOM-free. */
import type { StepReport } from '../../app/contract/readings';

function cell(value: string | number | null): string {
  if (value === null) return '';
  const text = String(value);
  // RFC 4180: quote fields holding a comma, quote or line break; double the quotes inside.
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function readingsCsv(steps: readonly StepReport[]): string {
  const rows = [['step', 'key', 'label', 'unit', 'value', 'expected', 'low', 'high', 'verdict'].join(',')];
  for (const step of steps) {
    for (const reading of step.readings) {
      rows.push([step.step, reading.key, reading.label, reading.unit, reading.value, reading.expected, reading.low, reading.high, reading.verdict].map(cell).join(','));
    }
  }
  return `${rows.join('\r\n')}\r\n`;
}
