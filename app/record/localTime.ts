/**
 * Instants are stored in UTC (milliseconds since 1970, ISO 8601 with Z at the edges) and shown in the local time
 * of whoever reads them, with the offset written out so a reviewer in another time zone reads the same instant:
 * `2026-03-01 10:00:00 +01:00`. `timeZone` is an IANA zone name; by default the computer's own.
 */
export function localTimeText(iso: string | null, timeZone?: string): string {
  if (iso === null) return '-';
  const instant = new Date(iso);
  if (Number.isNaN(instant.getTime())) return iso;
  const parts = new Intl.DateTimeFormat('en-GB', {
    timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit', hourCycle: 'h23',
  }).formatToParts(instant);
  const part = (type: Intl.DateTimeFormatPartTypes): number => Number(parts.find((entry) => entry.type === type)?.value ?? 0);
  const wallMs = Date.UTC(part('year'), part('month') - 1, part('day'), part('hour'), part('minute'), part('second'));
  const offsetMin = Math.round((wallMs - Math.floor(instant.getTime() / 1000) * 1000) / 60_000);
  const sign = offsetMin < 0 ? '-' : '+';
  const two = (value: number) => String(value).padStart(2, '0');
  const offset = `${sign}${two(Math.floor(Math.abs(offsetMin) / 60))}:${two(Math.abs(offsetMin) % 60)}`;
  return `${part('year')}-${two(part('month'))}-${two(part('day'))} ${two(part('hour'))}:${two(part('minute'))}:${two(part('second'))} ${offset}`;
}
