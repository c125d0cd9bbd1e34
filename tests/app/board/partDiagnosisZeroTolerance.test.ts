// A design may state a part's tolerance as 0 %: the design fuzz found a trim whose diagnosis then said the part was
// infinitely many tolerances off (a non-finite number in --json). The diagnosis keeps every figure finite.
import { describe, expect, it } from 'vitest';
import { diagnoseRamp } from '../../../app/board/partDiagnosis';
import { predictRamp } from '../../../app/board/rampModel';
import { halfWaveBoard } from '../sim/simFixtures';

describe('a part stated at 0 % tolerance', () => {
  it('measured off its value, it is a suspect a finite number of tolerances off', () => {
    const design = halfWaveBoard({ parts: { rEmitter: { ohm: 7500, tolerancePct: 0 }, rBiasTop: { ohm: 22000 }, rBiasBottom: { ohm: 100000 }, cRamp: { farad: 4.7e-7 } } });
    const measuredOhm = 8200;
    const prediction = predictRamp(design, { partOverrides: { rEmitter: measuredOhm } });
    const diagnosis = diagnoseRamp(design, { floorV: prediction.floorV, peakV: prediction.peakV, slopeVPerMs: prediction.slopeVPerS / 1000, clipped: false }, { known: { rEmitter: measuredOhm }, measured: { rEmitter: measuredOhm } });
    const suspect = diagnosis.suspects.find((entry) => entry.part === 'rEmitter');
    expect(suspect).toBeDefined();
    // 8200 / 7500 - 1 = 9.33 %, over the 0.005 % floor: 1867 tolerances off.
    expect(suspect?.tolerances).toBeCloseTo((8200 / 7500 - 1) / 0.00005, 3);
    for (const entry of diagnosis.suspects) expect(Number.isFinite(entry.tolerances)).toBe(true);
  });
});
