import { describe, expect, it } from 'vitest';
import { levelCrossings, referenceLevels, stateLevelsByHistogram, transitionDurationSamples } from '../../../app/signal/stateLevels';

describe('IEEE 181 helpers', () => {
  it('reference levels are 10, 50 and 90 % of the span (IEEE 181)', () => {
    const levels = referenceLevels({ lowV: 1, highV: 11 });
    expect(levels.proximalV).toBeCloseTo(2, 12);
    expect(levels.mesialV).toBeCloseTo(6, 12);
    expect(levels.distalV).toBeCloseTo(10, 12);
  });

  it('crossing instants interpolate linearly between the bracketing samples', () => {
    // 0 -> 4 V between samples 2 and 3: the 1 V level lies a quarter of the way.
    const crossings = levelCrossings([0, 0, 0, 4, 4, 4, 0], 1);
    expect(crossings).toHaveLength(2);
    expect(crossings[0].index).toBeCloseTo(2.25, 12);
    expect(crossings[0].direction).toBe('rising');
    expect(crossings[1].index).toBeCloseTo(5.75, 12);
    expect(crossings[1].direction).toBe('falling');
  });

  it('a record touching the level without passing it has no crossing', () => {
    expect(levelCrossings([0, 1, 0, 1, 0], 1)).toHaveLength(0);
  });

  it('transition duration of a linear edge is 80 % of its 0-100 % rise', () => {
    // 0 V for 10 samples, linear to 5 V over 20 samples, then flat: 10 %->90 % takes 16 samples.
    const record = Array.from({ length: 60 }, (_, i) => (i < 10 ? 0 : i < 30 ? ((i - 10) / 20) * 5 : 5));
    const levels = stateLevelsByHistogram(record);
    expect(levels).not.toBeNull();
    // Levels are bin centres: half a bin (5 V / 100 / 2) from the true 0 and 5 V.
    expect(levels?.lowV).toBeCloseTo(0.025, 9);
    expect(levels?.highV).toBeCloseTo(4.975, 9);
    expect(transitionDurationSamples(record, { lowV: 0, highV: 5 })).toBeCloseTo(16, 9);
  });

  it('a constant record has equal levels and no histogram resolution', () => {
    expect(stateLevelsByHistogram([2, 2, 2])).toEqual({ lowV: 2, highV: 2, binWidthV: 0 });
    expect(stateLevelsByHistogram([])).toBeNull();
  });
});
