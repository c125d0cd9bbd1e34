/**
 * A fleet histogram as the Logbook screen draws it, DOM-free: the bars as one stepped outline (filled to zero),
 * the board model's prediction as a line through the bin centres, and the chosen unit in words.
 */
import type { FleetFigureView } from '../../app/contract/records';

export interface Point {
  x: number;
  y: number;
}

/** The outline of the bars: up and across each bin, down to zero at the ends. */
export function histogramOutline(bins: FleetFigureView['bins']): Point[] {
  if (bins.length === 0) return [];
  const points: Point[] = [{ x: bins[0].fromValue, y: 0 }];
  for (const bin of bins) points.push({ x: bin.fromValue, y: bin.count }, { x: bin.toValue, y: bin.count });
  points.push({ x: bins[bins.length - 1].toValue, y: 0 });
  return points;
}

/** Units the prediction expects in each bin, at the bin's centre; empty without a prediction. */
export function predictedPoints(bins: FleetFigureView['bins']): Point[] {
  return bins.filter((bin) => bin.predicted !== null).map((bin) => ({ x: (bin.fromValue + bin.toValue) / 2, y: bin.predicted as number }));
}

function valueText(value: number, unit: string): string {
  return `${Number(value.toPrecision(4))} ${unit}`;
}

/** One or two sentences under the histogram: where the unit sits, and how many units the model does not explain. */
export function fleetPlacementText(figure: FleetFigureView): string {
  const parts: string[] = [];
  if (figure.marked) {
    const z = figure.marked.predictionZ;
    parts.push(
      `Unit ${figure.marked.serial}: ${valueText(figure.marked.value, figure.unit)}, above ${Math.round(100 * figure.marked.fleetFractionBelow)} % of the fleet` +
        (z === null ? '.' : Math.abs(z) < 0.05 ? ', at the model\'s mean.' : `, ${z >= 0 ? '+' : '−'}${Math.abs(z).toFixed(1)} standard deviations from the model's mean.`),
    );
  }
  if (figure.prediction) {
    parts.push(
      `Model: ${valueText(figure.prediction.mean, figure.unit)} ± ${valueText(figure.prediction.standardDeviation, figure.unit)} (one standard deviation); ` +
        (figure.outliers === 0 ? 'every unit within 3 standard deviations.' : `${figure.outliers} unit${figure.outliers === 1 ? '' : 's'} beyond 3 standard deviations: worth a look.`),
    );
  } else {
    parts.push('The design gives no prediction for this figure.');
  }
  return parts.join(' ');
}
