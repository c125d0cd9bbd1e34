/**
 * The drift plot's time axis: each session at its days since the unit's first session (the axis the trend is
 * fitted on, app/record/drift.ts), not at its session number, which on a shared logbook jumps by hundreds between
 * one unit's sessions. Ticks read as local dates, as local times (hours and minutes) when every session lies within
 * two days, with seconds too when within an hour.
 */
const msPerDay = 86_400_000;

export interface DriftAxis {
  /** Days since the first session, one per point, in the points' order. */
  days: number[];
  tick(day: number): string;
  /** A title naming what the ticks show. */
  title: string;
}

export function driftAxis(startedAt: readonly string[]): DriftAxis {
  const times = startedAt.map((text) => Date.parse(text));
  const originMs = times.length > 0 ? Math.min(...times) : 0;
  const days = times.map((time) => (time - originMs) / msPerDay);
  const spanDays = days.length > 0 ? Math.max(...days) : 0;
  const short = spanDays < 2;
  const withSeconds = spanDays < 1 / 24;
  const tick = (day: number): string => {
    const date = new Date(originMs + day * msPerDay);
    if (!short) return date.toLocaleDateString();
    return date.toLocaleTimeString([], withSeconds ? { hour: '2-digit', minute: '2-digit', second: '2-digit' } : { hour: '2-digit', minute: '2-digit' });
  };
  return { days, tick, title: short ? `Session time (from ${new Date(originMs).toLocaleDateString()})` : 'Session date' };
}
