/**
 * What the screens show of a unit under test: the commissioning steps with their readings against the design,
 * the cycle fold (recent cycles as degree-indexed points, 0-360 electrical degrees), link health and transfer points.
 * Plain numbers and arrays only, so every transport carries them as JSON.
 */
import { z } from 'zod';

/**
 * The four states of a check (NAMING.md): three verdicts a measurement earns, and "not measured yet" for a check
 * whose measurement does not exist (no tick, no cross). A reading that is only for information has no verdict at
 * all (null); a step is "not measured yet" until every check it carries has its measurement.
 */
export const verdictSchema = z.enum(['in-tolerance', 'marginal', 'out-of-tolerance', 'not-measured']);
export type Verdict = z.infer<typeof verdictSchema>;
/** A verdict a measurement earned: anything but "not measured yet". */
export type MeasuredVerdict = Exclude<Verdict, 'not-measured'>;

/** The commissioning steps of NAMING.md, in bench order. */
export const commissioningStepNames = ['sync', 'ramp', 'trim', 'transfer', 'limits', 'sign-off'] as const;
export const commissioningStepSchema = z.enum(commissioningStepNames);
export type CommissioningStep = z.infer<typeof commissioningStepSchema>;

/** The steps' titles as every screen, record and command prints them (DEVELOPERS.md, "Names we added"). */
export const commissioningStepTitles: Record<CommissioningStep, string> = {
  sync: 'Check sync',
  ramp: 'Check ramp',
  trim: 'Trim if needed',
  transfer: 'Record transfer curve',
  limits: 'Check limits and pulses',
  'sign-off': 'Sign off',
};

export const readingSchema = z.object({
  /** Stable key, e.g. `frequencyHz`, `rampPeakV`, `alphaMaxDeg`. */
  key: z.string(),
  /** What the technician reads beside the value, e.g. "Ramp peak". */
  label: z.string(),
  /** SI unit symbol the value is in ("V", "Hz", "deg", "us", "V/ms", "%", "" for counts). */
  unit: z.string(),
  value: z.number().nullable(),
  /** What the design asks for, when it asks for something. */
  expected: z.number().nullable(),
  /** Limits of the in-tolerance band, when there is one. */
  low: z.number().nullable(),
  high: z.number().nullable(),
  /** The check's state; null for a reading shown for information only (no tolerance applies to it). */
  verdict: verdictSchema.nullable(),
  /** One line a technician understands, e.g. "ramp flattens 14 deg before the half-cycle ends". */
  note: z.string().nullable(),
});
export type Reading = z.infer<typeof readingSchema>;

export const stepReportSchema = z.object({
  step: commissioningStepSchema,
  /** waiting: not enough data yet; measuring: readings are live; done: checked and recorded in the session. */
  status: z.enum(['waiting', 'measuring', 'done']),
  /**
   * The worst verdict of the step's checks once each has its measurement, else "not measured yet". Logbooks
   * written before that state existed kept null for a step without a verdict: read as "not measured yet".
   */
  verdict: verdictSchema.nullable().transform((verdict): Verdict => verdict ?? 'not-measured'),
  readings: z.array(readingSchema),
  /** Cycles the readings are based on. */
  cycles: z.number().int().nonnegative(),
  note: z.string().nullable(),
});
export type StepReport = z.infer<typeof stepReportSchema>;

/**
 * Step reports as the logbook keeps them (JSON of StepReport[]), or null when none were kept or the text does not
 * fit the contract (a foreign edit): the caller then recomputes from the stored readings.
 */
export function parseStepReports(json: string | null): StepReport[] | null {
  if (json === null) return null;
  let stored: unknown;
  try {
    stored = JSON.parse(json);
  } catch {
    return null;
  }
  const parsed = z.array(stepReportSchema).safeParse(stored);
  return parsed.success ? parsed.data.map(withNotMeasuredChecks) : null;
}

/**
 * Older logbooks wrote a check without its measurement as a null verdict, like a reading for information; a
 * reading with a tolerance band (or a limit) but no value was such a check: it reads as "not measured yet".
 */
function withNotMeasuredChecks(report: StepReport): StepReport {
  return {
    ...report,
    readings: report.readings.map((reading) => (reading.verdict === null && reading.value === null && (reading.low !== null || reading.high !== null) ? { ...reading, verdict: 'not-measured' } : reading)),
  };
}

/** One signal of one folded cycle, after min-max decimation (each bucket keeps its minimum and maximum so peaks survive). */
export const foldTraceSchema = z.object({
  /** Electrical degrees from the cycle's starting zero crossing, 0-360, non-decreasing. */
  deg: z.array(z.number()),
  /** Volts, one per entry of `deg`. */
  v: z.array(z.number()),
});
export type FoldTrace = z.infer<typeof foldTraceSchema>;

export const foldCycleSchema = z.object({
  /** Running cycle number within the link's stream. */
  index: z.number().int().nonnegative(),
  startS: z.number(),
  periodMs: z.number().positive(),
  sync: foldTraceSchema,
  ramp: foldTraceSchema,
  gate: foldTraceSchema,
  control: foldTraceSchema.nullable(),
  /** Zero crossings inside the cycle (degrees): 0, about 180, 360. */
  zeroCrossingsDeg: z.array(z.number()),
  /** Firing points (gate pulse 50 % rising crossings) inside the cycle (degrees). */
  firingDeg: z.array(z.number()),
});
export type FoldCycle = z.infer<typeof foldCycleSchema>;

/** `ended`: a capture file read to its end (a file has an end; a logger link does not). */
export const linkStateSchema = z.enum(['disconnected', 'connecting', 'streaming', 'stalled', 'lost', 'ended']);
export type LinkState = z.infer<typeof linkStateSchema>;

export const linkSourceSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('serial'), path: z.string() }),
  z.object({ kind: z.literal('virtual'), designName: z.string(), faults: z.array(z.string()) }),
  z.object({ kind: z.literal('capture'), fileName: z.string() }),
]);
export type LinkSource = z.infer<typeof linkSourceSchema>;

/** A link source in a technician's words, for the link panel and the logbook's link events. */
export function describeLinkSource(source: LinkSource): string {
  if (source.kind === 'serial') return `logger on ${source.path}`;
  if (source.kind === 'capture') return `capture file ${source.fileName}`;
  return `virtual board (${source.designName}${source.faults.length ? `, fault: ${source.faults.join(', ')}` : ''})`;
}

export const linkHealthSchema = z.object({
  state: linkStateSchema,
  source: linkSourceSchema.nullable(),
  /** Per-channel sample rate the logger announced. */
  sampleRateHz: z.number().nonnegative(),
  /** Samples per second per channel actually arriving, over the last second or so. */
  arrivingSamplesPerS: z.number().nonnegative(),
  blocks: z.number().int().nonnegative(),
  droppedBlocks: z.number().int().nonnegative(),
  droppedSamples: z.number().int().nonnegative(),
  crcErrors: z.number().int().nonnegative(),
  badLines: z.number().int().nonnegative(),
  /** Milliseconds since the last data line, null before the first. */
  lastDataAgoMs: z.number().nonnegative().nullable(),
  message: z.string().nullable(),
});
export type LinkHealth = z.infer<typeof linkHealthSchema>;

export const transferPointSchema = z.object({
  t: z.number(),
  controlV: z.number(),
  alphaDeg: z.number(),
});
export type TransferPoint = z.infer<typeof transferPointSchema>;

export const transferFitSchema = z.object({
  gainDegPerV: z.number(),
  offsetDeg: z.number(),
  maxDeviationDeg: z.number(),
  controlMinV: z.number(),
  controlMaxV: z.number(),
  points: z.number().int().nonnegative(),
});
export type TransferFit = z.infer<typeof transferFitSchema>;
