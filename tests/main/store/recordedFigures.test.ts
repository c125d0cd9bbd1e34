// A session's figures as recorded at its steps, and the fallback for sessions from before steps were kept.
import { describe, expect, it } from 'vitest';
import { noRecordedFigures, recordedFiguresOf } from '../../../main/store/recordedFigures';
import { recordedStepsJson } from './storeFixtures';

describe('recordedFiguresOf', () => {
  it('takes each figure from the step that recorded it', () => {
    const stepsJson = recordedStepsJson({ rampPeakV: 7.31, slopeVPerMs: 0.75, gainDegPerV: 23.9, offsetDeg: 2.6, alphaMinDeg: 10.2, alphaMaxDeg: 156.4 });
    expect(recordedFiguresOf({ stepsJson, readingsJson: null })).toEqual({ rampPeakV: 7.31, slopeVPerMs: 0.75, alphaJitterDeg: null, alphaGainDegPerV: 23.9, alphaOffsetDeg: 2.6, alphaMinDeg: 10.2, alphaMaxDeg: 156.4 });
  });

  it('with steps kept, a step not recorded gives nothing, never the readings of another moment', () => {
    const readingsJson = JSON.stringify({ ramp: { peakV: 10.4, slopeVPerMs: 1.07 }, transfer: null });
    expect(recordedFiguresOf({ stepsJson: '[]', readingsJson })).toEqual(noRecordedFigures);
  });

  it('a session from before steps were kept: the readings stored with it; nothing readable gives nothing', () => {
    const readingsJson = JSON.stringify({ ramp: { peakV: 7.29, slopeVPerMs: 0.74 }, transfer: { gainDegPerV: 24, offsetDeg: 3 } });
    expect(recordedFiguresOf({ stepsJson: null, readingsJson })).toMatchObject({ rampPeakV: 7.29, slopeVPerMs: 0.74, alphaGainDegPerV: 24, alphaOffsetDeg: 3, alphaMinDeg: null });
    expect(recordedFiguresOf({ stepsJson: null, readingsJson: '{not json' })).toEqual(noRecordedFigures);
    expect(recordedFiguresOf({ stepsJson: null, readingsJson: null })).toEqual(noRecordedFigures);
  });
});
