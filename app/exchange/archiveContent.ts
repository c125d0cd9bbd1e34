/**
 * The meaning of an archive's content, checked with the same rules as the logbook's own data: the board design
 * (parseBoardDesign: schema, ranges, physics), the stored readings (the analysis summary's shape), the step reports
 * (the contract's schema) and every table cell by its column's type. A recomputed hash makes a forged or broken
 * archive pass the hash check; this is what keeps it out of the logbook, where it would break the record, the
 * fleet, drift and session views (the probe's finding).
 */
import { z } from 'zod';
import { parseBoardDesign } from '../board/parseBoardDesign';
import type { BoardDesign } from '../board/design';
import { stepReportSchema } from '../contract/readings';
import { InputError } from '../errors';
import { archiveColumns, type ArchiveSession } from './archiveSchema';

const finite = z.number().refine(Number.isFinite, 'must be a finite number');
const maybe = finite.nullable();

const rampSummarySchema = z.object({
  floorV: maybe, peakV: maybe, slopeVPerMs: maybe, nonlinearityPct: maybe, clipped: z.boolean(),
  clippedIntervals: z.number().int().nonnegative(), chargingIntervals: z.number().int().nonnegative(),
  startDelayDeg: maybe, resetUs: maybe, peakMinV: maybe, peakMaxV: maybe,
});

const pulseSummarySchema = z.object({
  count: z.number().int().nonnegative(), alphaDeg: maybe, alphaStdDeg: maybe, alphaMinDeg: maybe, alphaMaxDeg: maybe, widthUs: maybe,
  amplitudeV: maybe, wrongHalfCycle: z.number().int().nonnegative(), missing: z.number().int().nonnegative(), multiplePulses: z.number().int().nonnegative(),
  gateLowV: maybe, gateHighV: maybe, controlV: maybe,
});

/** A capture's analysis summary as the logbook stores it (app/bench/readings.ts); fields added since the archive format began are optional. */
export const storedReadingsSchema = z.object({
  frequencyHz: maybe,
  cycles: z.number().int().nonnegative(),
  ramp: rampSummarySchema,
  pulse: pulseSummarySchema,
  transfer: z.object({ points: z.number().int().nonnegative(), gainDegPerV: finite, offsetDeg: finite, maxDeviationDeg: finite, controlMinV: finite, controlMaxV: finite }).loose().nullable(),
  perCycle: z.array(z.object({ t: finite, alphaDeg: maybe, rampPeakV: maybe, controlV: maybe })),
  rectifier: z.enum(['half-wave', 'full-wave']),
  syncPhaseDeg: finite,
  sampleRateHz: maybe,
  durationS: finite,
  firingIntervals: z.number().int().nonnegative(),
  frequencyDriftHz: maybe,
  frequencyDriftHzPerS: maybe.optional(),
  periodJitterUs: maybe,
  syncOffsetV: maybe.optional(),
  syncAmplitudeV: maybe.optional(),
  gaps: z.number().int().nonnegative(),
  invalidSamples: z.number().int().nonnegative(),
  balance: z.object({ alphaDeg: maybe, rampPeakV: maybe, alphaTriples: z.number().int().nonnegative(), rampTriples: z.number().int().nonnegative() }).nullable().optional(),
  timedIntervals: z.number().int().nonnegative().optional(),
});

type CellKind = 'int' | 'real' | 'text' | 'int?' | 'real?' | 'text?' | 'flag?';

/** Each carried column's type in the logbook schema (main/store/schema.ts); `?` where NULL is allowed. */
const columnKinds: { [Table in keyof typeof archiveColumns]: readonly CellKind[] } = {
  cycles: ['int', 'real', 'text?', 'real?', 'real?', 'real?', 'int?', 'int?', 'real?', 'real?', 'real?', 'real?', 'real?', 'flag?', 'real?', 'int'],
  transferPoints: ['int', 'real', 'real', 'real'],
  trims: ['text', 'real', 'real', 'text', 'text', 'int'],
  linkEvents: ['text', 'text', 'int', 'int'],
  partMeasurements: ['text', 'real', 'real', 'int'],
};

/** Why a cell does not fit its column, or null when it does. REAL columns may carry "Infinity"/"-Infinity" (ARCHIVE.md). */
function cellProblem(value: unknown, kind: CellKind): string | null {
  const nullable = kind.endsWith('?');
  if (value === null) return nullable ? null : 'must not be empty';
  const base = kind.replace('?', '');
  if (base === 'text') return typeof value === 'string' && value.length <= 100_000 ? null : 'must be text';
  if (base === 'real' && (value === 'Infinity' || value === '-Infinity')) return null;
  if (typeof value !== 'number' || !Number.isFinite(value)) return 'must be a number';
  if (base === 'int' && !Number.isSafeInteger(value)) return 'must be a whole number';
  if (base === 'flag' && value !== 0 && value !== 1) return 'must be 0 or 1';
  return null;
}

function parseJsonText(text: string, what: string, problems: string[]): unknown {
  try {
    return JSON.parse(text) as unknown;
  } catch (error) {
    problems.push(`${what} is not JSON (${(error as Error).message})`);
    return undefined;
  }
}

function zodProblems(result: z.ZodSafeParseResult<unknown>, what: string, problems: string[]): void {
  if (result.success) return;
  for (const issue of result.error.issues.slice(0, 5)) problems.push(`${what}${issue.path.length > 0 ? `.${issue.path.join('.')}` : ''}: ${issue.message}`);
}

/** Every problem with the meaning of an archived session, in words; empty when it is sound. Returns the design too. */
export function archiveContentProblems(session: ArchiveSession): { problems: string[]; design: BoardDesign | null } {
  const problems: string[] = [];
  let design: BoardDesign | null = null;
  const designJson = parseJsonText(session.design.designJson, 'design.designJson', problems);
  if (designJson !== undefined) {
    try {
      design = parseBoardDesign(designJson, 'design.designJson');
    } catch (error) {
      if (!(error instanceof InputError)) throw error;
      problems.push(`the board design fails validation: ${error.message}`);
    }
    if (design && design.name !== session.design.name) problems.push(`design.name "${session.design.name}" is not the name inside its designJson ("${design.name}")`);
  }
  const record = session.record;
  if (session.unit.serial.trim() === '' || session.unit.serial.length > 200) problems.push('unit.serial must be a serial number (1 to 200 characters)');
  if (record.endedAtMs !== null && record.endedAtMs < record.startedAtMs) problems.push('record.endedAtMs is before record.startedAtMs');
  if (record.cycleCount !== null && (record.cycleCount < 0 || record.cycleCount !== session.cycles.rows.length)) problems.push(`record.cycleCount ${record.cycleCount} is not the ${session.cycles.rows.length} cycles carried`);
  for (const [field, value] of [['alphaMeanDeg', record.alphaMeanDeg], ['rampPeakMedianV', record.rampPeakMedianV]] as const) {
    if (value !== null && !Number.isFinite(value)) problems.push(`record.${field} must be a finite number`);
  }
  if (record.readingsJson !== null) {
    const readings = parseJsonText(record.readingsJson, 'record.readingsJson', problems);
    if (readings !== undefined) zodProblems(storedReadingsSchema.safeParse(readings), 'record.readingsJson', problems);
  }
  if (record.stepsJson !== undefined) {
    const steps = parseJsonText(record.stepsJson, 'record.stepsJson', problems);
    if (steps !== undefined) zodProblems(z.array(stepReportSchema).safeParse(steps), 'record.stepsJson', problems);
  }
  for (const table of Object.keys(columnKinds) as Array<keyof typeof columnKinds>) {
    const section = session[table];
    if (!section) continue;
    const kinds = columnKinds[table];
    let reported = 0;
    section.rows.forEach((row, rowIndex) => {
      row.forEach((value, column) => {
        const problem = cellProblem(value, kinds[column]);
        if (problem && reported < 5) {
          reported += 1;
          problems.push(`${table} row ${rowIndex + 1}, ${archiveColumns[table][column]}: ${problem}`);
        }
      });
    });
  }
  for (const [index, capture] of session.captures.entries()) {
    if (new Set(capture.roles).size !== capture.roles.length) problems.push(`captures[${index}].roles names a signal twice`);
    if (!Number.isFinite(capture.sampleRateHz) || !Number.isFinite(capture.startS)) problems.push(`captures[${index}] needs a finite start and sample rate`);
  }
  return { problems, design };
}
