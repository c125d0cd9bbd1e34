/** Recall reports (recall.ts) as HTML pages: comparison, drift and fleet, for the report command and the screens. */
import { outcomeCounts } from '../../app/contract/records';
import { benchSummary } from '../../app/record/benchSummary';
import { localTimeText } from '../../app/record/localTime';
import { formatReading } from '../../app/record/recordModel';
import { renderRecallHtml, type RecallSection } from '../../app/record/renderRecallHtml';
import type { ComparisonReport, DriftReport, FleetReport, RecalledSession } from './recall';

const number = (value: number | null, unit: string) => (value === null ? '-' : formatReading(value, unit));

/** Sessions with the bench that did each one, times in this computer's local time with the offset (stored in UTC). */
function sessionsSection(heading: string, sessions: readonly RecalledSession[], options: { timeZone?: string }): RecallSection {
  const benches = new Set(sessions.map((session) => session.bench ?? '-'));
  return {
    heading,
    paragraphs: [`${sessions.length} session${sessions.length === 1 ? '' : 's'} from ${benches.size} bench${benches.size === 1 ? '' : 'es'}. Times are local, with their offset from UTC (the logbook stores UTC).`],
    table: {
      head: ['Session', 'Unit', 'Bench', 'Started', 'Status', 'Ramp peak', 'Alpha gain'],
      rows: sessions.map((session) => [`#${session.sessionId}`, session.unit, session.bench ?? '-', localTimeText(session.startedAt, options.timeZone), session.status, number(session.rampPeakV, 'V'), number(session.alphaGainDegPerV, 'deg/V')]),
    },
  };
}

export function comparisonPage(report: ComparisonReport, options: { now?: Date } = {}): string {
  const { comparison } = report;
  const section: RecallSection = {
    heading: `Unit ${comparison.a.unit}: session ${comparison.a.id} (${comparison.a.startedAt.slice(0, 10)}) against session ${comparison.b.id} (${comparison.b.startedAt.slice(0, 10)})`,
    warnings: report.flagged.length > 0 ? [`differences beyond the design tolerance: ${report.flagged.join(', ')}.`] : [],
    paragraphs: [
      ...(report.flagged.length === 0 ? ['No difference goes beyond the design tolerance.'] : []),
      'Figures are as recorded at each step (the board as signed for, after any trim); those marked "whole session" are over every cycle, before and after a trim and through the whole sweep, and are not judged. A count is never judged.',
    ],
    table: {
      head: ['Reading', 'Taken', `Session ${comparison.a.id}`, `Session ${comparison.b.id}`, 'Difference', 'Beyond tolerance'],
      rows: comparison.rows.map((row) => [
        row.label, row.scope === 'recorded' ? 'as recorded' : 'whole session', number(row.a, row.unit), number(row.b, row.unit), number(row.difference, row.unit),
        !row.judged || row.difference === null ? 'not judged' : row.beyondTolerance ? 'yes (flagged)' : 'no',
      ]),
      flaggedRows: comparison.rows.flatMap((row, index) => (row.beyondTolerance ? [index] : [])),
    },
    svgs: [report.transferSvg],
  };
  return renderRecallHtml(`Sessions side by side: ${comparison.a.unit}`, [section], { generatedAt: (options.now ?? new Date()).toISOString() });
}

export function driftPage(report: DriftReport, options: { now?: Date; timeZone?: string } = {}): string {
  const sections: RecallSection[] = [
    {
      heading: `Unit ${report.unit} (${report.designName}): figures across sessions`,
      warnings: report.warnings,
      paragraphs: [
        'Each figure is fitted by ordinary least squares against days since the first session; the band is the 95 % confidence band of the line (Student t, n - 2 degrees of freedom). A warning is raised when the line reaches a design limit within a year of the last session and the slope points that way with at least 90 % confidence.',
      ],
      table: {
        head: ['Figure', 'Design', 'Limits', 'Trend per day', 'Standard error', 'Sessions', 'Forecast'],
        rows: report.figures.map((figure) => [
          figure.label,
          number(figure.nominal, figure.unit),
          `${number(figure.limits.low, '')} to ${number(figure.limits.high, '')} ${figure.unit}`,
          figure.analysis.fit ? `${figure.analysis.fit.slope.toPrecision(3)} ${figure.unit}/day` : '-',
          figure.analysis.fit?.slopeStandardError ? figure.analysis.fit.slopeStandardError.toPrecision(2) : '-',
          String(figure.analysis.points.length),
          figure.analysis.message ?? 'too few sessions for a trend',
        ]),
        flaggedRows: report.figures.flatMap((figure, index) => (figure.analysis.warning ? [index] : [])),
      },
      svgs: report.figures.map((figure) => figure.svg),
    },
    sessionsSection(`The sessions of unit ${report.unit}, and the bench that did each`, report.sessions, options),
  ];
  return renderRecallHtml(`Drift of unit ${report.unit}`, sections, { generatedAt: (options.now ?? new Date()).toISOString() });
}

export function fleetPage(report: FleetReport, options: { now?: Date; timeZone?: string } = {}): string {
  const sections: RecallSection[] = report.figures.map((figure) => ({
    heading: `${figure.label} over ${figure.values.length} units`,
    warnings: figure.outliers > 0 ? [`${figure.outliers} unit(s) lie beyond three standard deviations of the prediction.`] : [],
    paragraphs: [
      `Each unit's latest session, as recorded at its steps; how they ended: ${outcomeCounts(report.outcomes)}.`,
      figure.prediction
        ? `Monte Carlo prediction of the board model (version ${report.designVersion}): mean ${number(figure.prediction.mean, figure.unit)}, standard deviation ${number(figure.prediction.standardDeviation, figure.unit)}, design ${number(figure.prediction.nominal, figure.unit)}.`
        : 'No prediction for this figure.',
      ...(figure.marked
        ? [`Unit ${figure.marked.serial}: ${number(figure.marked.value, figure.unit)}, above ${(100 * figure.marked.fleetFractionBelow).toFixed(0)} % of the fleet${figure.marked.predictionZ === null ? '' : `, ${figure.marked.predictionZ >= 0 ? '+' : ''}${figure.marked.predictionZ.toFixed(2)} standard deviations from the predicted mean`}.`]
        : []),
    ],
    table: { head: ['From', 'To', 'Units', 'Predicted'], rows: figure.bins.map((bin) => [number(bin.fromValue, figure.unit), number(bin.toValue, figure.unit), String(bin.count), bin.predicted === null ? '-' : bin.predicted.toFixed(1)]) },
    svgs: [figure.svg],
  }));
  sections.push({
    heading: 'By bench',
    paragraphs: ['Each unit counts once, with its latest session, under the bench that did that session.'],
    table: {
      head: ['Bench', 'Units', 'Mean ramp peak', 'Mean alpha gain'],
      rows: benchSummary(report.members).map((bench) => [bench.bench ?? '-', String(bench.units), number(bench.rampPeakMeanV, 'V'), number(bench.alphaGainMeanDegPerV, 'deg/V')]),
    },
  });
  sections.push(sessionsSection('The units and the session each is counted by', report.members, options));
  return renderRecallHtml(`Fleet of ${report.designName}: ${report.units} units`, sections, { generatedAt: (options.now ?? new Date()).toISOString() });
}
