import { describe, expect, it } from 'vitest';
import type { FleetFigureView } from '../../../app/contract/records';
import { fleetPlacementText, histogramOutline, predictedPoints } from '../../../renderer/shaping/fleetShapes';

// Three bins of a made-up fleet of five units (our own numbers).
const figure: FleetFigureView = {
  key: 'rampPeakV', label: 'Ramp peak', unit: 'V', count: 5,
  bins: [
    { fromValue: 7.0, toValue: 7.1, count: 1, predicted: 0.8 },
    { fromValue: 7.1, toValue: 7.2, count: 3, predicted: 3.1 },
    { fromValue: 7.2, toValue: 7.3, count: 1, predicted: 0.9 },
  ],
  prediction: { nominal: 7.15, mean: 7.148, standardDeviation: 0.05 },
  outliers: 0,
  marked: { serial: 'U-3', value: 7.25, predictionZ: 2.04, fleetFractionBelow: 0.8 },
};

describe('fleet histogram shapes', () => {
  it('outlines the bars from zero to zero, and puts the prediction at the bin centres', () => {
    expect(histogramOutline(figure.bins)).toEqual([
      { x: 7.0, y: 0 }, { x: 7.0, y: 1 }, { x: 7.1, y: 1 }, { x: 7.1, y: 3 }, { x: 7.2, y: 3 }, { x: 7.2, y: 1 }, { x: 7.3, y: 1 }, { x: 7.3, y: 0 },
    ]);
    expect(histogramOutline([])).toEqual([]);
    const predicted = predictedPoints(figure.bins);
    expect(predicted.map((point) => point.y)).toEqual([0.8, 3.1, 0.9]);
    expect(predicted[1].x).toBeCloseTo(7.15, 12);
    expect(predictedPoints(figure.bins.map((bin) => ({ ...bin, predicted: null })))).toEqual([]);
  });

  it('places the unit in words, and says how many units the model does not explain', () => {
    expect(fleetPlacementText(figure)).toBe('Unit U-3: 7.25 V, above 80 % of the fleet, +2.0 standard deviations from the model\'s mean. Model: 7.148 V ± 0.05 V (one standard deviation); every unit within 3 standard deviations.');
    // Under a twentieth of a standard deviation reads as on the mean, not as "-0.0".
    expect(fleetPlacementText({ ...figure, marked: { ...figure.marked!, predictionZ: -0.03 } })).toMatch(/^Unit U-3: 7\.25 V, above 80 % of the fleet, at the model's mean\. /);
    expect(fleetPlacementText({ ...figure, marked: null, outliers: 2 })).toBe('Model: 7.148 V ± 0.05 V (one standard deviation); 2 units beyond 3 standard deviations: worth a look.');
    expect(fleetPlacementText({ ...figure, marked: { ...figure.marked!, predictionZ: -1.26 }, prediction: null })).toBe('Unit U-3: 7.25 V, above 80 % of the fleet, −1.3 standard deviations from the model\'s mean. The design gives no prediction for this figure.');
  });
});
