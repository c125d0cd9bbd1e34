/**
 * The lines an instrument writes above the column names (model, date, record length, sample interval): the one
 * that states the sampling, for a file whose columns hold no time.
 */
import { secondsPerTimeUnit } from './csvText';

/** `Sample interval,2e-05` / `Sampling period: 20 us` / `Sample rate;50 kS/s`: the interval in seconds, or null. */
export function intervalOfHeaderLine(text: string, decimalMark: string): number | null {
  const lower = text.toLowerCase();
  const isInterval = /(sample|sampling)[\s_-]*(interval|period|time)|time[\s_-]*(step|interval|increment|resolution)|x[\s_-]*inc|delta[\s_-]*t\b|^\s*dt\b/.test(lower);
  const isRate = !isInterval && /(sample|sampling)[\s_-]*(rate|frequency|freq)|^\s*fs\b/.test(lower);
  if (!isInterval && !isRate) return null;
  const numberText = decimalMark === ',' ? '[+-]?(?:\\d+(?:,\\d*)?|,\\d+)(?:[eE][+-]?\\d+)?' : '[+-]?(?:\\d+(?:\\.\\d*)?|\\.\\d+)(?:[eE][+-]?\\d+)?';
  const match = new RegExp(`[:;,=\\t\\s](\\s*)(${numberText})\\s*[,;\\t]?\\s*([a-zµμ/]*)`, 'i').exec(text);
  if (!match) return null;
  const value = Number(match[2].replace(',', '.'));
  if (!(value > 0) || !Number.isFinite(value)) return null;
  const unit = match[3].toLowerCase();
  if (isInterval) {
    const perUnit = secondsPerTimeUnit[unit] ?? (unit === '' ? 1 : undefined);
    return perUnit === undefined ? null : value * perUnit;
  }
  const multiplier: Record<string, number> = { '': 1, hz: 1, 's/s': 1, sps: 1, khz: 1e3, 'ks/s': 1e3, ksps: 1e3, mhz: 1e6, 'ms/s': 1e6, msps: 1e6 };
  const factor = multiplier[unit];
  return factor === undefined ? null : 1 / (value * factor);
}

