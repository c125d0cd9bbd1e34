/**
 * Recall over the logbook: two sessions side by side with their transfer curves overlaid, a unit's drift across
 * sessions with the trend warning, and a board design's fleet against the board model's Monte Carlo prediction.
 * Each returns plain data plus its plot as an SVG string (app/record/plots.ts), ready for a screen or a page.
 */
import type { SessionOutcome } from '../../app/contract/records';
import type { BoardDesign } from '../../app/board/design';
import { analyseTolerances } from '../../app/board/toleranceAnalysis';
import { InputError, isInputError } from '../../app/errors';
import { analyseDrift, type DriftAnalysis, type DriftLimits, type DriftOptions } from '../../app/record/drift';
import { designFigures, trendedFigures, type TrendedFigure } from '../../app/record/designFigures';
import { figureToSvg } from '../../app/record/figure';
import { fleetFigure, gainPredictionFromPeak, type FleetFigure } from '../../app/record/fleet';
import { driftFigure, fleetHistogramFigure, transferFigure } from '../../app/record/plots';
import type { SessionComparison } from '../store/logbookTypes';
import type { RecordSources } from './buildRecord';
import { parseStoredDesign } from '../store/storedContent';

const designOf = (json: string, what: string): BoardDesign => parseStoredDesign(json, what);

export interface ComparisonReport {
  comparison: SessionComparison;
  /** Rows whose difference is beyond the design tolerance (the logbook's comparison decides it). */
  flagged: string[];
  transferSvg: string;
}

export async function compareReport(sources: RecordSources, aId: number, bId: number): Promise<ComparisonReport> {
  const comparison = await sources.logbook.compareSessions(aId, bId);
  const [a, b] = await Promise.all([sources.logbook.session(aId), sources.logbook.session(bId)]);
  const transferSvg = figureToSvg(
    transferFigure(
      [
        { label: `session ${aId}`, points: comparison.transferA, fit: a?.transfer.fit ?? null },
        { label: `session ${bId}`, points: comparison.transferB, fit: b?.transfer.fit ?? null },
      ],
      { title: `Transfer curves of sessions ${aId} and ${bId} overlaid, with their least-squares lines` },
    ),
  );
  return { comparison, flagged: comparison.rows.filter((row) => row.beyondTolerance).map((row) => row.label), transferSvg };
}

export interface DriftFigureReport {
  key: TrendedFigure;
  label: string;
  unit: string;
  nominal: number | null;
  limits: DriftLimits;
  analysis: DriftAnalysis;
  svg: string;
}

/** One session as the recall pages list it: which bench did it and when (a shared logbook holds many benches'). */
export interface RecalledSession {
  sessionId: number;
  unit: string;
  bench: string | null;
  startedAt: string;
  status: string;
  rampPeakV: number | null;
  alphaGainDegPerV: number | null;
}

export interface DriftReport {
  unit: string;
  designName: string;
  figures: DriftFigureReport[];
  warnings: string[];
  sessions: RecalledSession[];
}

/** A unit's figures across its sessions, against the limits of the design version of its latest session. */
export async function driftReport(sources: RecordSources, unitSerial: string, options: DriftOptions = {}): Promise<DriftReport> {
  const drift = await sources.logbook.unitDrift(unitSerial);
  const last = drift.points[drift.points.length - 1];
  if (!last) throw new InputError(`unit "${unitSerial}" has no sessions yet`, sources.logbook.location);
  const detail = await sources.logbook.session(last.sessionId);
  const version = await sources.logbook.designVersion(detail!.designId);
  const expected = designFigures(designOf(version.designJson, `${sources.logbook.location}: board design "${version.name}" version ${version.version}`));
  const figures = trendedFigures.map(({ key, label, unit }) => {
    const analysis = analyseDrift(drift.points.map((point) => ({ sessionId: point.sessionId, startedAt: point.startedAt, value: point[key] })), expected[key].limits, { unit, ...options });
    return { key, label, unit, nominal: expected[key].nominal, limits: expected[key].limits, analysis, svg: figureToSvg(driftFigure(analysis, expected[key].limits, { label, unit })) };
  });
  const rows = new Map((await sources.logbook.listSessions({ unitSerial })).map((row) => [row.id, row]));
  const sessions = drift.points.map((point): RecalledSession => ({
    sessionId: point.sessionId, unit: unitSerial, bench: rows.get(point.sessionId)?.bench ?? null, startedAt: point.startedAt, status: rows.get(point.sessionId)?.status ?? '-',
    rampPeakV: point.rampPeakV, alphaGainDegPerV: point.alphaGainDegPerV,
  }));
  return { unit: unitSerial, designName: version.name, figures, warnings: figures.filter((figure) => figure.analysis.warning).map((figure) => `${figure.label}: ${figure.analysis.message}`), sessions };
}

export interface UnitInFleet {
  serial: string;
  value: number;
  /** (value - predicted mean) / predicted sd; null without a prediction. */
  predictionZ: number | null;
  /** Fraction of the fleet's units with a lower value (0-1). */
  fleetFractionBelow: number;
}

export interface FleetReport {
  designName: string;
  designVersion: number;
  units: number;
  /** How the units' latest sessions ended: a fleet of abandoned sessions reads differently from a signed one. */
  outcomes: Record<SessionOutcome, number>;
  figures: Array<FleetFigure & { svg: string; marked: UnitInFleet | null }>;
  /** Each unit's latest session, the one its figures come from, with the bench that did it. */
  members: RecalledSession[];
}

/**
 * Each unit's latest session of the design, histogrammed, with the Monte Carlo prediction of the newest version.
 * With `unitSerial`, that unit is marked on each histogram and placed against the fleet and the prediction.
 */
export async function fleetReport(sources: RecordSources, designName: string, options: { runs?: number; seed?: number; binCount?: number; unitSerial?: string } = {}): Promise<FleetReport> {
  const version = await sources.logbook.latestDesignVersion(designName);
  if (!version) throw new InputError(`there is no board design "${designName}" in this logbook`, sources.logbook.location);
  const design = designOf(version.designJson, `${sources.logbook.location}: board design "${version.name}" version ${version.version}`);
  const latest = await sources.logbook.latestSessionPerUnit(designName);
  if (options.unitSerial !== undefined && !latest.some((entry) => entry.unit === options.unitSerial)) {
    throw new InputError(`unit "${options.unitSerial}" has no session of board design "${designName}"`, sources.logbook.location);
  }
  const peaks: number[] = [];
  const gains: number[] = [];
  const chosen: { rampPeakV: number | null; alphaGainDegPerV: number | null } = { rampPeakV: null, alphaGainDegPerV: null };
  const rows = new Map((await sources.logbook.listSessions({ designName })).map((row) => [row.id, row]));
  const members: RecalledSession[] = [];
  for (const { unit, sessionId } of latest) {
    // One session that cannot be read (damaged pages) leaves the fleet to the others rather than break it.
    const figures = await sources.logbook.sessionFigures(sessionId).catch((error: unknown) => {
      if (isInputError(error)) return null;
      throw error;
    });
    const row = rows.get(sessionId);
    members.push({ sessionId, unit, bench: row?.bench ?? null, startedAt: figures?.startedAt ?? row?.startedAt ?? '', status: row?.status ?? '-', rampPeakV: figures?.rampPeakV ?? null, alphaGainDegPerV: figures?.alphaGainDegPerV ?? null });
    if (figures?.rampPeakV !== null && figures?.rampPeakV !== undefined) peaks.push(figures.rampPeakV);
    if (figures?.alphaGainDegPerV !== null && figures?.alphaGainDegPerV !== undefined) gains.push(figures.alphaGainDegPerV);
    if (unit === options.unitSerial && figures) Object.assign(chosen, { rampPeakV: figures.rampPeakV, alphaGainDegPerV: figures.alphaGainDegPerV });
  }
  const outcomes: Record<SessionOutcome, number> = { 'signed-off': 0, 'signed-off-with-exceptions': 0, closed: 0, interrupted: 0, open: 0 };
  for (const { sessionId } of latest) {
    const outcome = rows.get(sessionId)?.outcome;
    if (outcome) outcomes[outcome] += 1;
  }
  const tolerance = analyseTolerances(design, { runs: options.runs ?? 500, seed: options.seed ?? 1 });
  const nominalGain = designFigures(design).alphaGainDegPerV.nominal;
  const peakFigure = fleetFigure('rampPeakV', peaks, { nominal: tolerance.peakV.nominal, mean: tolerance.peakV.mean, standardDeviation: tolerance.peakV.standardDeviation }, options);
  const gainFigure = fleetFigure('alphaGainDegPerV', gains, nominalGain === null ? null : gainPredictionFromPeak(tolerance.peakV, nominalGain), options);
  return {
    designName,
    designVersion: version.version,
    units: latest.length,
    outcomes,
    members,
    figures: [peakFigure, gainFigure].map((figure) => {
      const value = chosen[figure.key];
      const marked: UnitInFleet | null = options.unitSerial === undefined || value === null ? null : {
        serial: options.unitSerial,
        value,
        predictionZ: figure.prediction && figure.prediction.standardDeviation > 0 ? (value - figure.prediction.mean) / figure.prediction.standardDeviation : null,
        fleetFractionBelow: figure.values.filter((other) => other < value).length / figure.values.length,
      };
      return { ...figure, marked, svg: figureToSvg(fleetHistogramFigure(figure, { highlight: marked ? { label: marked.serial, value: marked.value } : null })) };
    }),
  };
}
