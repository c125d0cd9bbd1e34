/**
 * The drift plot's time axis: sessions placed by date (days since the first), whatever their session numbers, with
 * date ticks over a long span and time-of-day ticks within two days.
 */
import { describe, expect, it } from 'vitest';
import { driftAxis } from '../../../renderer/shaping/driftAxis';

describe('drift plot axis', () => {
  it('places sessions by days since the first, not by session number', () => {
    // A unit's sessions on a shared logbook: numbers #12, #480, #913 mean nothing on a time axis; 0, 30 and 95 days do.
    const axis = driftAxis(['2026-02-01T08:00:00Z', '2026-03-03T08:00:00Z', '2026-05-07T20:00:00Z']);
    expect(axis.days).toEqual([0, 30, 95.5]);
    expect(axis.title).toBe('Session date');
    expect(axis.tick(30)).toBe(new Date('2026-03-03T08:00:00Z').toLocaleDateString());
  });

  it('reads as times of day when every session lies within two days', () => {
    const axis = driftAxis(['2026-02-01T08:00:00Z', '2026-02-01T09:30:00Z']);
    expect(axis.days[1]).toBeCloseTo(1.5 / 24, 12);
    expect(axis.tick(axis.days[1])).toBe(new Date('2026-02-01T09:30:00Z').toLocaleTimeString([], { hour: '2-digit', minute: '2-digit' }));
    expect(axis.title).toContain(new Date('2026-02-01T08:00:00Z').toLocaleDateString());
    // Within an hour (measured, trimmed, measured again) the seconds tell the sessions apart.
    const hour = driftAxis(['2026-02-01T08:00:00Z', '2026-02-01T08:00:40Z']);
    expect(hour.tick(hour.days[1])).toBe(new Date('2026-02-01T08:00:40Z').toLocaleTimeString([], { hour: '2-digit', minute: '2-digit', second: '2-digit' }));
  });

  it('takes the earliest session as the origin whatever the order', () => {
    expect(driftAxis(['2026-02-11T00:00:00Z', '2026-02-01T00:00:00Z']).days).toEqual([10, 0]);
  });
});
