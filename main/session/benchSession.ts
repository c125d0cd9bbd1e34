/**
 * The open session at the bench: the unit, the design version it is judged against, the logbook writer, the steps
 * recorded so far and the changes fitted. Everything the pipeline measures goes into the writer (batched by the
 * store); `checkStep` records a step's readings; `applyTrim` records a change and asks for a re-check.
 */
import type { BoardDesign } from '../../app/board/design';
import type { CycleReading } from '../../app/bench/readings';
import { commissioningStepNames, type CommissioningStep, type OpenSession, type StepReport } from '../../app/contract';
import type { LinkProblem } from '../../app/logger';
import { linkEventKindOfProblem, type LogbookWriter } from '../store/logbookTypes';
import { noExtremes, type BenchPipeline } from './benchPipeline';
import type { KnownParts } from './knownParts';
import { currentStepOf, recordStep, stepReports, type StepInputs } from './steps';

export interface BenchSession {
  readonly open: OpenSession;
  readonly design: BoardDesign;
  readonly writer: LogbookWriter;
  recorded: Partial<Record<CommissioningStep, StepReport>>;
  recheckNeeded: boolean;
  trimsApplied: number;
  signedOff: boolean;
  /** Parts on the board that differ from the design: measured by the technician, or fitted through a trim. */
  knownParts: KnownParts;
}


/** Steps during which the board's ramp is settled, so (control, alpha) points belong to its transfer curve. */
const sweepSteps: readonly CommissioningStep[] = ['transfer', 'limits', 'sign-off'];

/**
 * Records what one push of lines produced; cheap, the writer only queues. Every cycle is kept, but transfer
 * points only once sync, ramp and trim are recorded: before a trim the board is a different board, and its
 * points would bend the session's transfer curve.
 */
export function recordMeasurements(session: BenchSession, cycles: readonly CycleReading[], problems: readonly LinkProblem[]): void {
  const sweeping = sweepSteps.includes(currentStepOf(session));
  for (const cycle of cycles) {
    session.writer.addCycle(cycle);
    if (sweeping && cycle.controlV !== null && cycle.alphaDeg !== null) session.writer.addTransferPoint({ t: cycle.t, controlV: cycle.controlV, alphaDeg: cycle.alphaDeg });
  }
  for (const problem of problems) session.writer.addLinkEvent(linkEventKindOfProblem[problem.code] ?? 'decoder-problem', problem.message);
}

export function stepInputsOf(session: BenchSession | null, design: BoardDesign, pipeline: BenchPipeline | null): StepInputs {
  return {
    design: session?.design ?? design,
    window: pipeline?.lastWindow() ?? null,
    transferFit: pipeline?.transferFit() ?? null,
    extremes: pipeline?.alphaExtremes() ?? noExtremes,
    recorded: session?.recorded ?? {},
    recheckNeeded: session?.recheckNeeded ?? false,
    trimsApplied: session?.trimsApplied ?? 0,
    signedOff: session?.signedOff ?? false,
  };
}

/** The steps recorded so far, in commissioning order, to the logbook: what recall shows later. */
export function saveRecordedSteps(session: BenchSession): void {
  const reports = commissioningStepNames.map((step) => session.recorded[step]).filter((report): report is StepReport => report !== undefined);
  session.writer.setStepsJson(JSON.stringify(reports));
}

/**
 * Records the live report of a step. Refused, with the reason in words, while the step has nothing measured or
 * its checks lack their measurement.
 */
export function checkSessionStep(session: BenchSession, pipeline: BenchPipeline, step: CommissioningStep): { recorded: StepReport } | { refused: string } {
  const inputs = stepInputsOf(session, session.design, pipeline);
  const live = stepReports({ ...inputs, recorded: {}, recheckNeeded: false }).find((report) => report.step === step);
  if (!live) throw new Error(`no live report for the ${step} step`);
  const outcome = recordStep(live);
  if ('refused' in outcome) return outcome;
  const recorded = outcome.recorded;
  session.recorded[step] = recorded;
  if (step === 'ramp' && session.recheckNeeded) {
    session.recheckNeeded = false;
    // The re-checked ramp answers the trim step too: it now shows the result of the change.
    const trim = stepReports({ ...stepInputsOf(session, session.design, pipeline), recorded: {} }).find((report) => report.step === 'trim');
    const trimOutcome = trim ? recordStep(trim) : null;
    if (trimOutcome && 'recorded' in trimOutcome) session.recorded.trim = trimOutcome.recorded;
  }
  const window = pipeline.lastWindow();
  const fit = pipeline.transferFit();
  if (window) session.writer.setReadings({ ...window, transfer: fit ?? window.transfer });
  saveRecordedSteps(session);
  return { recorded };
}

export function currentStep(session: BenchSession | null): CommissioningStep {
  return session ? currentStepOf(session) : 'sync';
}
