/**
 * Records the screens ask for: designs, units, sessions, trim plans, logbook rows and comparisons.
 * Times are ISO 8601 strings (UTC) so they cross every transport unchanged.
 */
import { z } from 'zod';
import { boardDesignSchema } from '../board/design';
import { foldTraceSchema, linkHealthSchema, stepReportSchema, transferFitSchema, transferPointSchema, commissioningStepSchema } from './readings';

export const isoTimeSchema = z.string().regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:\d{2})$/, 'a time must be ISO 8601, e.g. 2026-03-01T09:30:00Z');

export const designSummarySchema = z.object({
  name: z.string(),
  version: z.number().int().positive(),
  mainsHz: z.number(),
  rectifier: z.enum(['half-wave', 'full-wave']),
  rampTargetV: z.number(),
  savedAt: isoTimeSchema.nullable(),
});
export type DesignSummary = z.infer<typeof designSummarySchema>;

export const storedDesignSchema = z.object({
  summary: designSummarySchema,
  design: boardDesignSchema,
});
export type StoredDesign = z.infer<typeof storedDesignSchema>;

export const designProblemSchema = z.object({ field: z.string(), message: z.string() });
export type DesignProblem = z.infer<typeof designProblemSchema>;

export const unitSummarySchema = z.object({
  serial: z.string(),
  designName: z.string().nullable(),
  sessions: z.number().int().nonnegative(),
  lastSessionAt: isoTimeSchema.nullable(),
});
export type UnitSummary = z.infer<typeof unitSummarySchema>;

export const sessionStatusSchema = z.enum(['open', 'closed', 'interrupted']);

/**
 * How a session ended, as the logbook keeps it: signed off (every step recorded and within tolerance), signed off
 * with exceptions (steps missing or failing, with the technician's written reason), closed without sign-off,
 * interrupted (the recorder stopped), or still open.
 */
export const sessionOutcomes = ['signed-off', 'signed-off-with-exceptions', 'closed', 'interrupted', 'open'] as const;
export const sessionOutcomeSchema = z.enum(sessionOutcomes);
export type SessionOutcome = z.infer<typeof sessionOutcomeSchema>;

/** Outcomes in words, for every screen, record and command: `text` starts a sentence, `phrase` sits inside one. */
export const outcomeWords: Record<SessionOutcome, { text: string; phrase: string }> = {
  'signed-off': { text: 'Signed off', phrase: 'signed off' },
  'signed-off-with-exceptions': { text: 'Signed off with exceptions', phrase: 'signed off with exceptions' },
  closed: { text: 'Closed without sign-off', phrase: 'closed without sign-off' },
  interrupted: { text: 'Interrupted', phrase: 'interrupted' },
  open: { text: 'Open', phrase: 'still open' },
};

/** "2 signed off, 1 closed without sign-off": the outcomes that occur, in these words. */
export function outcomeCounts(outcomes: Record<SessionOutcome, number>): string {
  const present = sessionOutcomes.filter((outcome) => outcomes[outcome] > 0).map((outcome) => `${outcomes[outcome]} ${outcomeWords[outcome].phrase}`);
  return present.length > 0 ? present.join(', ') : 'no sessions';
}

/** A step the sign-off gate stopped at: not recorded, recorded without its measurement, or out of tolerance. */
export const signOffExceptionSchema = z.object({
  step: commissioningStepSchema,
  problem: z.enum(['not-recorded', 'not-measured', 'out-of-tolerance']),
  /** Labels of the readings behind it (the failing or unmeasured checks); empty for a step not recorded. */
  readings: z.array(z.string()),
});
export type SignOffException = z.infer<typeof signOffExceptionSchema>;

/** The sign-off gate as the bench sees it before signing: what stands in the way of a plain sign-off. */
export const signOffGateSchema = z.object({
  /** True when every step is recorded and within tolerance: "Sign off" needs nothing more. */
  clear: z.boolean(),
  exceptions: z.array(signOffExceptionSchema),
  /** Shortest written reason accepted for signing off with exceptions (characters). */
  reasonMinimumCharacters: z.number().int().positive(),
});
export type SignOffGate = z.infer<typeof signOffGateSchema>;

export const openSessionSchema = z.object({
  id: z.number().int().positive(),
  unitSerial: z.string(),
  designName: z.string(),
  designVersion: z.number().int().positive(),
  operator: z.string(),
  startedAt: isoTimeSchema,
});
export type OpenSession = z.infer<typeof openSessionSchema>;



export const trimSuggestionSchema = z.object({
  /** `repair`: a part outside its tolerance, measured and replaced with its design value; `trim`: a bias change. */
  kind: z.enum(['repair', 'trim']),
  /** The position (the design file's key), or `transistor` for the ramp transistor. Screens name it in words. */
  part: z.string(),
  /** The board's own designator (e.g. R7), when the design names it. */
  partRef: z.string().nullable(),
  method: z.enum(['replace', 'parallel', 'series']),
  /** Resistor positions: the value there now (a repair: the value the ramp points to, or the one measured). */
  fromOhm: z.number().positive().nullable(),
  /** Resistor positions: the effective resistance after the change (a repair: the design value). */
  toOhm: z.number().positive().nullable(),
  /** The ramp capacitor: the value the ramp points to (or measured), and the design value it is replaced with. */
  fromFarad: z.number().positive().nullable(),
  toFarad: z.number().positive().nullable(),
  /** The resistor to add for parallel/series, null for replace. */
  addOhm: z.number().positive().nullable(),
  series: z.string(),
  predictedPeakV: z.number(),
  predictedAlphaMaxDeg: z.number().nullable(),
  headroomV: z.number().nullable(),
  /** The predicted peak lies inside the design's ramp tolerance band. */
  withinTolerance: z.boolean(),
  reason: z.string(),
  /** The model's ramp after the change over one charging interval, for drawing over the measured one. */
  predictedRamp: foldTraceSchema.nullable(),
  /** A second position changed with this one (a divider change that also needs a new emitter resistor). */
  alsoChange: z.object({ part: z.string(), partRef: z.string().nullable(), fromOhm: z.number().positive(), toOhm: z.number().positive() }).nullable(),
});
export type TrimSuggestion = z.infer<typeof trimSuggestionSchema>;

/**
 * A part value the plan took from the board as built rather than from the design: measured by the technician, or
 * fitted this session through "I fitted this". Ohm for resistors, farad for the capacitor.
 */
export const knownPartSchema = z.object({
  part: z.string(),
  partRef: z.string().nullable(),
  value: z.number().positive(),
  designValue: z.number().positive(),
  source: z.enum(['measured', 'fitted']),
});
export type KnownPart = z.infer<typeof knownPartSchema>;

export const trimPlanSchema = z.object({
  inTolerance: z.boolean(),
  /** `repair`: a part is off and its replacement comes first; `trim`: a bias trim; `no-fix`: no trim reaches the target. */
  status: z.enum(['in-tolerance', 'repair', 'trim', 'no-fix']),
  /** One line: how far off the ramp is and the first thing to do. */
  summary: z.string(),
  /** The reasoning behind it, each thing once. */
  notes: z.array(z.string()),
  /** Summary and notes as one paragraph. */
  message: z.string(),
  measuredPeakV: z.number().nullable(),
  targetPeakV: z.number(),
  /**
   * What the board actually does, from its ramp. `explanation` says which reading the planner predicts with: an
   * effective V_EB ('veb'), or, when no junction could be that far off, a capacitance error ('capacitance';
   * then vebV is only the formal solution and is not shown as a V_EB).
   */
  estimate: z
    .object({
      chargingCurrentA: z.number(),
      designCurrentA: z.number(),
      vebV: z.number(),
      explanation: z.enum(['veb', 'capacitance']),
      capacitanceErrorPct: z.number(),
      ambiguity: z.string(),
    })
    .nullable(),
  suggestions: z.array(trimSuggestionSchema),
  measuredRamp: foldTraceSchema.nullable(),
  /** Parts the plan took as they are on the board, not as designed. */
  knownParts: z.array(knownPartSchema),
});
export type TrimPlanView = z.infer<typeof trimPlanSchema>;

export const appliedTrimSchema = z.object({
  id: z.number().int().positive(),
  part: z.string(),
  /** The part's value before and after in its own unit: ohm, or farad for the ramp capacitor (0 for the transistor). */
  fromOhm: z.number(),
  toOhm: z.number(),
  reason: z.string(),
  at: isoTimeSchema,
});
export type AppliedTrim = z.infer<typeof appliedTrimSchema>;

export const sessionRowSchema = z.object({
  id: z.number().int().positive(),
  unit: z.string(),
  designName: z.string(),
  designVersion: z.number().int().positive(),
  operator: z.string(),
  status: sessionStatusSchema,
  outcome: sessionOutcomeSchema,
  /** The technician's written reason for signing off with exceptions; null otherwise. */
  signOffReason: z.string().nullable(),
  /** What was excepted at sign-off; empty unless the outcome is signed-off-with-exceptions. */
  signOffExceptions: z.array(signOffExceptionSchema),
  startedAt: isoTimeSchema,
  endedAt: isoTimeSchema.nullable(),
  /** Cycles measured over the whole session: a count, never judged. */
  cycles: z.number().int().nonnegative(),
  /** Ramp peak as recorded at the ramp step (after any trim and its re-check). */
  rampPeakV: z.number().nullable(),
  /** Smallest and largest alpha as recorded at the limits step. */
  alphaMinDeg: z.number().nullable(),
  alphaMaxDeg: z.number().nullable(),
  /** Over every cycle of the session (before and after a trim, a whole sweep): shown only labelled as such. */
  wholeSession: z.object({ rampPeakMedianV: z.number().nullable(), alphaMeanDeg: z.number().nullable() }),
  linkErrors: z.number().int().nonnegative(),
  /** Seconds the logger sent nothing (stretches over 2 s), 0 for a link that never went quiet. */
  linkSilentS: z.number().nonnegative(),
  /** The bench that recorded it (null for sessions from before benches were named). */
  bench: z.string().nullable(),
  /** When this bench pushed it to the shared logbook; null when not yet (or when this is the shared logbook). */
  sharedAt: isoTimeSchema.nullable(),
});
export type SessionRow = z.infer<typeof sessionRowSchema>;

export const benchStateSchema = z.object({
  session: openSessionSchema.nullable(),
  link: linkHealthSchema,
  /** The screen's plot is frozen; data still flows into the session. */
  held: z.boolean(),
  steps: z.array(stepReportSchema),
  currentStep: commissioningStepSchema,
  /** True after "I fitted this" until the ramp has been checked again. */
  recheckNeeded: z.boolean(),
  /** What stands between the open session and a plain sign-off (the service checks the same at sign-off). */
  signOffGate: signOffGateSchema,
  /**
   * The session closed last at this bench (signed off or not), with its steps as recorded, until the next one
   * starts: what the Bench screen shows instead of live verdicts once no session is open.
   */
  lastSession: z.object({ row: sessionRowSchema, steps: z.array(stepReportSchema) }).nullable(),
  /**
   * Counts the service's state changes (a step recorded, a session opened or closed...). A live frame carries the
   * count it was made under: a screen lays a frame's step reports over this state only when its count is not older.
   */
  stateSerial: z.number().int().nonnegative(),
});
export type BenchState = z.infer<typeof benchStateSchema>;

export const linkEventSchema = z.object({ at: isoTimeSchema, kind: z.string(), detail: z.string() });

export const sessionDetailSchema = z.object({
  row: sessionRowSchema,
  notes: z.string().nullable(),
  /** Readings recorded at each step's check, with verdicts against the design version the session used. */
  steps: z.array(stepReportSchema),
  transfer: z.object({ points: z.array(transferPointSchema), fit: transferFitSchema.nullable() }),
  trims: z.array(appliedTrimSchema),
  /** Part values measured on the board (ohm; farad for cRamp), as told to the trim planner. */
  partMeasurements: z.array(z.object({ part: z.string(), value: z.number(), designValue: z.number(), at: isoTimeSchema })),
  linkEvents: z.array(linkEventSchema),
  /** Per-cycle summary for plots over the session (decimated to a few hundred rows). */
  perCycle: z.array(z.object({ t: z.number(), alphaDeg: z.number().nullable(), rampPeakV: z.number().nullable(), controlV: z.number().nullable() })),
  captures: z.array(z.object({ id: z.number().int().positive(), startS: z.number(), seconds: z.number(), label: z.string().nullable() })),
});
export type SessionDetail = z.infer<typeof sessionDetailSchema>;

export const sessionComparisonSchema = z.object({
  a: sessionRowSchema,
  b: sessionRowSchema,
  rows: z.array(
    z.object({
      key: z.string(),
      label: z.string(),
      unit: z.string(),
      a: z.number().nullable(),
      b: z.number().nullable(),
      difference: z.number().nullable(),
      /** 'recorded': as recorded at the steps; 'whole-session': over every cycle, shown labelled as such. */
      scope: z.enum(['recorded', 'whole-session']),
      /** True when the design gives the figure a tolerance; a count or a whole-session figure is never judged. */
      judged: z.boolean(),
      /** True when the difference is larger than the design's tolerance for that reading. */
      beyondTolerance: z.boolean(),
    }),
  ),
  transferA: z.array(transferPointSchema),
  transferB: z.array(transferPointSchema),
});
export type SessionComparison = z.infer<typeof sessionComparisonSchema>;

/** A unit's figures at one session, as recorded at its steps (the board as signed for). */
export const driftPointSchema = z.object({
  sessionId: z.number().int().positive(),
  startedAt: isoTimeSchema,
  /** How the session ended: a trend read across signed and abandoned sessions alike must say which is which. */
  outcome: sessionOutcomeSchema,
  rampPeakV: z.number().nullable(),
  slopeVPerMs: z.number().nullable(),
  alphaGainDegPerV: z.number().nullable(),
  alphaOffsetDeg: z.number().nullable(),
  /** Firing jitter at a held control, as recorded at the ramp step. */
  alphaJitterDeg: z.number().nullable(),
});
export type DriftPoint = z.infer<typeof driftPointSchema>;

/**
 * A board design's fleet: each unit's latest session, one histogram per figure (ramp peak, alpha gain) with the
 * board model's Monte Carlo prediction as the count each bin should hold, and the chosen unit placed in it.
 */
export const fleetFigureSchema = z.object({
  key: z.enum(['rampPeakV', 'alphaGainDegPerV']),
  label: z.string(),
  unit: z.string(),
  /** Units with this figure measured. */
  count: z.number().int().nonnegative(),
  bins: z.array(z.object({ fromValue: z.number(), toValue: z.number(), count: z.number().int().nonnegative(), predicted: z.number().nullable() })),
  prediction: z.object({ nominal: z.number(), mean: z.number(), standardDeviation: z.number() }).nullable(),
  /** Units beyond the prediction's mean +- 3 sd. */
  outliers: z.number().int().nonnegative(),
  marked: z.object({ serial: z.string(), value: z.number(), predictionZ: z.number().nullable(), fleetFractionBelow: z.number().min(0).max(1) }).nullable(),
});
export type FleetFigureView = z.infer<typeof fleetFigureSchema>;

export const fleetViewSchema = z.object({
  designName: z.string(),
  designVersion: z.number().int().positive(),
  units: z.number().int().nonnegative(),
  /** How each unit's latest session ended, counted by outcome. */
  outcomes: z.record(sessionOutcomeSchema, z.number().int().nonnegative()),
  figures: z.array(fleetFigureSchema),
  /** The same units split by the bench that did each one's latest session (a shared logbook holds a line's). */
  benches: z.array(z.object({ bench: z.string().nullable(), units: z.number().int().positive(), rampPeakMeanV: z.number().nullable(), alphaGainMeanDegPerV: z.number().nullable() })),
});
export type FleetView = z.infer<typeof fleetViewSchema>;

export const exportFormatSchema = z.object({
  id: z.string(),
  label: z.string(),
  mediaType: z.string(),
  extension: z.string(),
});
export type ExportFormat = z.infer<typeof exportFormatSchema>;

