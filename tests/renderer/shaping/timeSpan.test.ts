// A session's span on the screens: the end's date is written when it is not the start's local day.
import { describe, expect, it } from 'vitest';
import { localSpanText } from '../../../renderer/shaping/timeSpan';

/** The same instants as local-time fields, so the checks hold in whatever zone the tests run. */
const local = (year: number, month: number, day: number, hour: number, minute: number) => new Date(year, month - 1, day, hour, minute);

describe('localSpanText', () => {
  it('gives only the end\'s time on the start\'s day', () => {
    const start = local(2026, 11, 16, 8, 10);
    const end = local(2026, 11, 16, 8, 52);
    expect(localSpanText(start.toISOString(), end.toISOString())).toBe(`${start.toLocaleString()} to ${end.toLocaleTimeString()}`);
  });

  it('gives the end\'s date as well over midnight and days later', () => {
    const start = local(2026, 11, 16, 23, 40);
    for (const end of [local(2026, 11, 17, 0, 25), local(2026, 12, 3, 12, 28)]) {
      const text = localSpanText(start.toISOString(), end.toISOString());
      expect(text).toBe(`${start.toLocaleString()} to ${end.toLocaleString()}`);
      expect(text).toContain(end.toLocaleDateString());
    }
  });

  it('gives the start alone for a session not ended', () => {
    const start = local(2026, 11, 16, 9, 40);
    expect(localSpanText(start.toISOString(), null)).toBe(start.toLocaleString());
  });
});
