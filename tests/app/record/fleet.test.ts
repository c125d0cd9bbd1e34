/** Fleet histogram and the Monte Carlo overlay. */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fleetFigure, gainPredictionFromPeak, histogramBins } from '../../../app/record/fleet';

describe('fleet histogram', () => {
  it('counts every unit once and puts each in the bin that holds it', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: 6, max: 9, noNaN: true }), { minLength: 1, maxLength: 80 }), (values) => {
        const bins = histogramBins(values, null);
        expect(bins.reduce((sum, bin) => sum + bin.count, 0)).toBe(values.length);
        for (let i = 1; i < bins.length; i++) expect(bins[i].fromValue).toBeCloseTo(bins[i - 1].toValue, 12);
      }),
      { numRuns: 150 },
    );
  });

  it('expects units per bin from the normal curve: about 68.3 % within one sd (normal table)', () => {
    // Six bins over mean +- 3 sd, each one sd wide: the middle two hold 2 x 0.3413 of the units.
    const values = Array.from({ length: 1000 }, () => 7.3);
    const bins = histogramBins(values, { nominal: 7.3, mean: 7.3, standardDeviation: 0.1 }, { binCount: 6 });
    expect(bins[0].fromValue).toBeCloseTo(7.0, 12);
    expect(bins[5].toValue).toBeCloseTo(7.6, 12);
    expect((bins[2].predicted ?? 0) + (bins[3].predicted ?? 0)).toBeCloseTo(682.7, 0);
    expect(bins[0].predicted!).toBeCloseTo(21.4, 0); // 0.0214 between 2 and 3 sd
  });

  it('flags units beyond three standard deviations of the prediction', () => {
    const figure = fleetFigure('rampPeakV', [7.3, 7.31, 7.29, 7.9], { nominal: 7.3, mean: 7.3, standardDeviation: 0.05 });
    expect(figure.outliers).toBe(1);
  });

  it('alpha gain prediction from the ramp peak agrees with propagating the draws themselves (first order)', () => {
    // Draw peaks around 7.3 V with 2 % spread, map each to a gain inverse to it, compare with the first-order formula.
    const nominalPeak = 7.3;
    const nominalGain = 24;
    const peaks = Array.from({ length: 4001 }, (_, index) => nominalPeak * (1 + 0.02 * Math.sqrt(3) * (2 * (index / 4000) - 1)));
    const mean = peaks.reduce((sum, value) => sum + value, 0) / peaks.length;
    const sd = Math.sqrt(peaks.reduce((sum, value) => sum + (value - mean) ** 2, 0) / (peaks.length - 1));
    const gains = peaks.map((peak) => (nominalGain * nominalPeak) / peak);
    const gainMean = gains.reduce((sum, value) => sum + value, 0) / gains.length;
    const gainSd = Math.sqrt(gains.reduce((sum, value) => sum + (value - gainMean) ** 2, 0) / (gains.length - 1));
    const prediction = gainPredictionFromPeak({ nominal: nominalPeak, mean, standardDeviation: sd, min: 0, max: 0 }, nominalGain)!;
    // First order drops the curvature of 1/x: mean off by about sd^2/mean^2 (0.04 %), sd by a few parts in a thousand.
    expect(Math.abs(prediction.mean - gainMean) / gainMean).toBeLessThan(1e-3);
    expect(Math.abs(prediction.standardDeviation - gainSd) / gainSd).toBeLessThan(1e-2);
  });
});
