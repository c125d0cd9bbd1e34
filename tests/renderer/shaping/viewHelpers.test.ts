import { describe, expect, it } from 'vitest';
import type { FoldCycle, Reading, StepReport } from '../../../app/contract/readings';
import { FoldPointsCache, foldCyclesPoints, growScale } from '../../../renderer/shaping/foldPoints';
import { stepReadingsCsv } from '../../../app/exchange/recordCsv';
import { designText, mergeSteps, pickReading } from '../../../renderer/shaping/stepView';
import { fitLinePoints, transferPointsCsv, transferRangeV } from '../../../renderer/shaping/transferView';
import { verdictView } from '../../../renderer/shaping/verdictView';
import { stepVerdictOf, worstMeasuredVerdict } from '../../../app/contract/verdicts';

const reading = (key: string, value: number | null, extra: Partial<Reading> = {}): Reading => ({ key, label: key, unit: 'V', value, expected: null, low: null, high: null, verdict: null, note: null, ...extra });
const report = (step: StepReport['step'], status: StepReport['status'], readings: Reading[]): StepReport => ({ step, status, verdict: 'not-measured', readings, cycles: readings.length ? 10 : 0, note: null });

describe('verdicts', () => {
  it('always give words and an icon, not colour alone (NAMING.md)', () => {
    for (const verdict of ['in-tolerance', 'marginal', 'out-of-tolerance', 'not-measured'] as const) {
      const view = verdictView(verdict);
      expect(view.text.length).toBeGreaterThan(3);
      expect(view.icon.length).toBeGreaterThan(0);
    }
    expect(verdictView('out-of-tolerance').text).toBe('Out of tolerance');
    // "Not measured yet": words, and neither a tick nor a cross.
    expect(verdictView('not-measured')).toMatchObject({ text: 'Not measured yet', className: 'not-measured' });
    expect(verdictView('not-measured').icon).not.toMatch(/[✓✕]/);
  });

  it('the worst measured verdict wins; a step is not measured while any check lacks its measurement', () => {
    expect(worstMeasuredVerdict(['in-tolerance', 'marginal', null])).toBe('marginal');
    expect(worstMeasuredVerdict(['marginal', 'out-of-tolerance', 'in-tolerance'])).toBe('out-of-tolerance');
    expect(worstMeasuredVerdict([null, 'not-measured'])).toBeNull();
    expect(stepVerdictOf([{ verdict: 'in-tolerance' }, { verdict: null }])).toBe('in-tolerance');
    expect(stepVerdictOf([{ verdict: 'out-of-tolerance' }, { verdict: 'not-measured' }])).toBe('not-measured');
    // Only readings for information: nothing was judged, so there is no verdict to give.
    expect(stepVerdictOf([{ verdict: null }])).toBe('not-measured');
    expect(stepVerdictOf([])).toBe('not-measured');
  });
});

describe('step list', () => {
  it('lists all six steps in bench order, live readings over recorded ones, recorded status kept', () => {
    const recorded = [report('sync', 'done', [reading('frequencyHz', 50.01)])];
    const live = [report('sync', 'measuring', [reading('frequencyHz', 49.98)]), report('ramp', 'measuring', [reading('rampPeakV', 5.2)])];
    const rows = mergeSteps(recorded, live);
    expect(rows.map((row) => row.step)).toEqual(['sync', 'ramp', 'trim', 'transfer', 'limits', 'sign-off']);
    expect(rows[0].recorded).toBe(true);
    expect(rows[0].report.status).toBe('done');
    expect(rows[0].report.readings[0].value).toBe(49.98);
    expect(rows[1].recorded).toBe(false);
    expect(rows[2].report.status).toBe('waiting');
  });

  it('finds readings by key and writes the design expectation', () => {
    const steps = [report('ramp', 'measuring', [reading('rampPeakV', 5.9, { expected: 6, low: 5.82, high: 6.18 })])];
    const found = pickReading(steps, ['peakV', 'rampPeakV']);
    expect(found?.value).toBe(5.9);
    expect(pickReading(steps, ['alphaDeg'])).toBeNull();
    expect(designText(found as Reading, (value) => `${value} V`)).toBe('design 6 V, 5.82 V to 6.18 V');
    expect(designText(reading('x', 1), String)).toBeNull();
  });
});

describe('fold points', () => {
  const trace = (values: number[]) => ({ deg: values.map((_, index) => (index * 360) / values.length), v: values });
  const cycle = (index: number, peakV: number): FoldCycle => ({
    index,
    startS: index * 0.02,
    periodMs: 20,
    sync: trace([0, 1, 0, -1]),
    ramp: trace([0, peakV / 2, peakV, 0]),
    gate: trace([0, 0, 5, 0]),
    control: null,
    zeroCrossingsDeg: [0, 180, 360],
    firingDeg: [95 + index],
  });

  it('keeps the newest cycle apart, joins older ones with line breaks, and collects every firing point', () => {
    const points = foldCyclesPoints([cycle(0, 6), cycle(1, 6.2), cycle(2, 6.4)], { bucketCount: 100 });
    expect(points.cycles).toBe(3);
    expect(points.newest.ramp.map((point) => point.y)).toEqual([0, 3.2, 6.4, 0]);
    // Two older cycles of four points each and one gap between them.
    expect(points.older.ramp.length).toBe(9);
    expect(Number.isNaN(points.older.ramp[4].y)).toBe(true);
    expect(points.firingDeg).toEqual([95, 96, 97]);
    expect(points.highV).toBe(6.4);
    expect(points.lowV).toBe(-1);
    expect(points.newest.control).toEqual([]);
  });

  it('reuses a cycle’s points from the cache and redoes a cycle whose stream restarted', () => {
    const cache = new FoldPointsCache();
    const first = cache.points([cycle(0, 6), cycle(1, 6.2)], { bucketCount: 100 });
    const second = cache.points([cycle(0, 6), cycle(1, 6.2), cycle(2, 6.4)], { bucketCount: 100 });
    expect(second.older.ramp.slice(0, 4)).toEqual(first.older.ramp.slice(0, 4));
    // Same running index, new start time: a new stream, so its points are worked out again.
    const restarted = { ...cycle(0, 9), startS: 100 };
    const third = cache.points([restarted, cycle(9, 6)], { bucketCount: 100 });
    expect(Math.max(...third.older.ramp.map((point) => point.y))).toBe(9);
  });

  it('shows at most the requested number of cycles', () => {
    const cycles = Array.from({ length: 30 }, (_, index) => cycle(index, 6));
    expect(foldCyclesPoints(cycles, { bucketCount: 50, maxCycles: 20 }).cycles).toBe(20);
  });

  it('grows the volts scale but never shrinks it', () => {
    const first = growScale(null, -1, 6.4);
    expect(first.lowV).toBeLessThanOrEqual(-1.5);
    expect(first.highV).toBeGreaterThanOrEqual(6.9);
    const second = growScale(first, 0, 3);
    expect(second).toEqual(first);
    expect(growScale(first, -1, 12).highV).toBeGreaterThanOrEqual(12.5);
  });
});

describe('transfer helpers', () => {
  it('draws the fit across the range from its gain and offset', () => {
    const line = fitLinePoints({ gainDegPerV: 30, offsetDeg: 15, maxDeviationDeg: 0.5, controlMinV: 0, controlMaxV: 5, points: 100 }, 0, 5);
    expect(line).toEqual([{ x: 0, y: 15 }, { x: 5, y: 165 }]);
  });

  it('widens the range to hold every point, rounded out to half volts', () => {
    expect(transferRangeV([{ controlV: -0.2 }, { controlV: 5.3 }], { fromV: 0, toV: 5 })).toEqual({ fromV: -0.5, toV: 5.5 });
    expect(transferRangeV([], { fromV: 0, toV: 5 })).toEqual({ fromV: 0, toV: 5 });
  });

  it('writes CSV with units in the header and CRLF line ends (RFC 4180)', () => {
    expect(transferPointsCsv([{ t: 0.5, controlV: 1.25, alphaDeg: 52.5 }])).toBe('t_s,control_V,alpha_deg\r\n0.5,1.25,52.5\r\n');
  });

  it('writes the readings as recorded, quoting those that hold commas or quotes (RFC 4180); information has no verdict', () => {
    const csv = stepReadingsCsv([report('ramp', 'done', [reading('rampPeakV', 6, { label: 'Ramp peak, end of "half"', verdict: 'in-tolerance' }), reading('slopeVPerMs', 0.75)])]);
    const lines = csv.split('\n');
    expect(lines[0]).toBe('step,reading,label,value,design,low,high,unit,verdict,note');
    expect(lines[1]).toBe('ramp,rampPeakV,"Ramp peak, end of ""half""",6,,,,V,in-tolerance,');
    expect(lines[2]).toBe('ramp,slopeVPerMs,slopeVPerMs,0.75,,,,V,,');
  });
});
