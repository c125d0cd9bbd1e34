/**
 * The fleet of a board design for the Logbook screen: main/record/recall.ts fleetReport (each unit's latest session
 * against the board model's Monte Carlo prediction) without its drawn SVG, which the screen draws itself, and the
 * fleet split by bench.
 */
import type { FleetView } from '../../app/contract';
import { benchSummary } from '../../app/record/benchSummary';
import { fleetReport } from '../record/recall';
import type { ExportContext } from './exporters';

/** Monte Carlo runs for the prediction: 500 puts the predicted sd within about 3 % (1/sqrt(2n), common practice). */
const predictionRuns = 500;

export async function fleetView(context: ExportContext, designName: string, unitSerial: string | undefined): Promise<FleetView> {
  const report = await fleetReport(context, designName, { unitSerial, runs: predictionRuns });
  return {
    designName: report.designName,
    designVersion: report.designVersion,
    units: report.units,
    outcomes: report.outcomes,
    figures: report.figures.map((figure) => ({
      key: figure.key,
      label: figure.label,
      unit: figure.unit,
      count: figure.values.length,
      bins: figure.bins,
      prediction: figure.prediction,
      outliers: figure.outliers,
      marked: figure.marked,
    })),
    benches: benchSummary(report.members),
  };
}
