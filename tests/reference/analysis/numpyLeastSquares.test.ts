/**
 * Least-squares slope and ramp nonlinearity cross-checked against numpy.polyfit (Debian python3-numpy, run by
 * /usr/bin/python3) on the very same samples: an outside implementation of the same fit.
 */
import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { fitLine } from '../../../app/signal/leastSquares';
import { analyzeRampSegment } from '../../../app/signal/rampSegment';
import { normalSource, quantise } from '../../app/bench/syntheticBoard';

const python = '/usr/bin/python3';
const numpyAvailable = spawnSync(python, ['-c', 'import numpy'], { stdio: 'ignore' }).status === 0;

interface PolyfitCase {
  x: number[];
  y: number[];
}

/** numpy.polyfit(x, y, 1) for each case: slope, intercept and the largest |residual|. */
function numpyPolyfit(cases: PolyfitCase[]): Array<{ slope: number; intercept: number; maxAbsResidual: number }> {
  const script = [
    'import json, sys',
    'import numpy as np',
    'out = []',
    'for case in json.load(sys.stdin):',
    '    x = np.array(case["x"], dtype=float); y = np.array(case["y"], dtype=float)',
    '    slope, intercept = np.polyfit(x, y, 1)',
    '    out.append({"slope": slope, "intercept": intercept, "maxAbsResidual": float(np.max(np.abs(y - np.polyval([slope, intercept], x))))})',
    'json.dump(out, sys.stdout)',
  ].join('\n');
  const result = spawnSync(python, ['-c', script], { input: JSON.stringify(cases), encoding: 'utf8', maxBuffer: 64 << 20 });
  if (result.status !== 0) throw new Error(`python failed: ${result.stderr}`);
  return JSON.parse(result.stdout);
}

/** A ramp firing interval of our own: floor, slope, Early-effect droop, noise and ADC bits chosen per case. */
function rampRecord(seed: number): { values: Float64Array; halfCycle: number; margin: number } {
  const noise = normalSource(seed);
  const halfCycle = 100 + ((seed * 37) % 400);
  const margin = Math.ceil(0.05 * halfCycle);
  const floorV = 0.05 * (seed % 7);
  const slopeVPerSample = 8 / halfCycle;
  const droop = 0.05 * (seed % 5);
  const resetSamples = 2 + (seed % 5);
  const values = new Float64Array(halfCycle + 2 * margin);
  for (let i = 0; i < values.length; i++) {
    const t = i - margin - resetSamples / 2;
    const length = halfCycle - resetSamples;
    const v = t > 0 && t < length ? floorV + slopeVPerSample * (t - (droop * t * t) / (2 * length)) : floorV;
    values[i] = quantise(v + 0.004 * (1 + (seed % 3)) * noise(), 8 + (seed % 9));
  }
  return { values, halfCycle, margin };
}

describe.skipIf(!numpyAvailable)('least squares against numpy.polyfit', () => {
  it('fitLine equals numpy.polyfit on random data, offsets up to an hour of seconds', () => {
    const noise = normalSource(77);
    const cases: PolyfitCase[] = [];
    for (let k = 0; k < 20; k++) {
      const count = 3 + k * 13;
      const offset = k % 2 === 0 ? 0 : 3600 * (k / 20);
      const x = Array.from({ length: count }, (_, i) => offset + i * 2e-5 * (1 + k));
      const y = x.map((value) => 1.7 * (value - offset) * 1000 - 0.2 + 0.01 * noise());
      cases.push({ x, y });
    }
    const reference = numpyPolyfit(cases);
    cases.forEach((data, k) => {
      const fit = fitLine(data.x, data.y);
      // Relative 1e-6 on the slope: numpy solves by SVD (lstsq), we by centred sums; with x offsets of 3600 s and
      // steps of 20 us both lose some digits, and agreement to a part per million is far below any reading's need.
      expect(Math.abs((fit?.slope ?? 0) - reference[k].slope) / Math.abs(reference[k].slope)).toBeLessThan(1e-6);
      expect(Math.abs((fit?.maxAbsResidual ?? 0) - reference[k].maxAbsResidual)).toBeLessThan(1e-6);
    });
  });

  it('ramp slope and nonlinearity equal numpy.polyfit on the same linear-part samples', () => {
    const records = Array.from({ length: 24 }, (_, seed) => rampRecord(seed + 1));
    const segments = records.map((record) =>
      analyzeRampSegment(record.values, { windowStartIndex: record.margin, windowEndIndex: record.margin + record.halfCycle, minimumSpanV: 0.5 }),
    );
    const cases: PolyfitCase[] = segments.map((segment, k) => {
      if (!segment) throw new Error(`record ${k}: no ramp found`);
      const x = Array.from({ length: segment.linearTo - segment.linearFrom }, (_, i) => segment.linearFrom + i);
      return { x, y: x.map((index) => records[k].values[index]) };
    });
    const reference = numpyPolyfit(cases);
    segments.forEach((segment, k) => {
      if (!segment) return;
      expect(segment.fitSamples).toBe(cases[k].x.length);
      // Same samples, same fit: agreement to rounding (1e-9 relative on a slope of about 0.02-0.08 V per sample).
      expect(segment.slopeVPerSample).toBeCloseTo(reference[k].slope, 9);
      expect(segment.nonlinearityPct).toBeCloseTo((reference[k].maxAbsResidual / Math.abs(segment.peakV)) * 100, 6);
    });
  });
});
