import type { ComtradeConfig, ComtradeDateTime } from './comtradeConfig';

function two(value: number): string {
  return String(value).padStart(2, '0');
}

/** `dd/mm/yyyy,hh:mm:ss.ssssss` (1999 on), with nine decimals when the time base is nanoseconds. */
export function formatComtradeDateTime(time: Omit<ComtradeDateTime, 'text'>, timeBaseS = 1e-6): string {
  const decimals = timeBaseS < 1e-6 ? 9 : 6;
  const unitsPerSecond = 10 ** decimals;
  // Round once in whole units so 59.9999999 s cannot print as 59.1000000.
  const units = Math.min(Math.round(time.second * unitsPerSecond), 60 * unitsPerSecond - 1);
  const whole = Math.floor(units / unitsPerSecond);
  const fraction = String(units - whole * unitsPerSecond).padStart(decimals, '0');
  return `${two(time.day)}/${two(time.month)}/${time.year},${two(time.hour)}:${two(time.minute)}:${two(whole)}.${fraction}`;
}

/** Shortest exact text of a number for a configuration field. */
function numberText(value: number): string {
  return Number.isFinite(value) ? String(value) : '0';
}

/**
 * Writes a .cfg (IEEE C37.111, 1999 or 2013 layout as in REFERENCES.md; a 1991 config is written in the 1999
 * layout). Lines end in CR LF as the standard asks. Commas in names are replaced by spaces: a comma would shift every field.
 */
export function formatComtradeConfig(config: ComtradeConfig): string {
  const clean = (text: string) => text.replace(/[,\r\n]/g, ' ');
  const revision = config.revision === 1991 ? 1999 : config.revision;
  const lines: string[] = [];
  lines.push(`${clean(config.stationName)},${clean(config.recorderId)},${revision}`);
  const analogCount = config.analogChannels.length;
  const digitalCount = config.digitalChannels.length;
  lines.push(`${analogCount + digitalCount},${analogCount}A,${digitalCount}D`);
  for (const channel of config.analogChannels) {
    lines.push(
      [
        channel.number,
        clean(channel.id),
        clean(channel.phase),
        clean(channel.circuit),
        clean(channel.unit),
        numberText(channel.multiplier),
        numberText(channel.offset),
        numberText(channel.skewUs),
        numberText(channel.minimum),
        numberText(channel.maximum),
        numberText(channel.primary),
        numberText(channel.secondary),
        channel.scaling,
      ].join(','),
    );
  }
  for (const channel of config.digitalChannels) {
    lines.push([channel.number, clean(channel.id), clean(channel.phase), clean(channel.circuit), channel.normalState].join(','));
  }
  lines.push(numberText(config.lineFrequencyHz));
  lines.push(String(config.sampleRates.length));
  for (const rate of config.sampleRates) lines.push(`${numberText(rate.rateHz)},${rate.endSample}`);
  if (config.sampleRates.length === 0) lines.push(`0,${config.endSampleWithoutRate ?? 0}`);
  lines.push(formatComtradeDateTime(config.firstSampleTime, config.timeBaseS));
  lines.push(formatComtradeDateTime(config.triggerTime, config.timeBaseS));
  lines.push(config.fileType);
  lines.push(numberText(config.timeMultiplier));
  if (revision === 2013) {
    lines.push(`${clean(config.timeCode ?? '0')},${clean(config.localCode ?? '0')}`);
    lines.push(`${clean(config.timeQualityCode ?? 'F')},${clean(config.leapSecond ?? '0')}`);
  }
  return lines.join('\r\n') + '\r\n';
}
