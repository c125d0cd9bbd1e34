/**
 * The virtual board as a link source: the virtual logger (app/sim) producing protocol lines in-process, paced by a
 * timer at `speed` times real time, or pumped by hand (the demo and tests run faster than real time that way).
 * Fitting a part or moving the control voltage rebuilds the virtual logger, as a power cycle of the board would:
 * it greets again and restarts its block count, so analysis restarts cleanly after the change.
 */
import type { BoardDesign, PartRole } from '../../app/board/design';
import { designValueOf } from '../../app/board/measuredParts';
import { partName } from '../../app/board/partNames';
import type { LinkSource, VirtualControl } from '../../app/contract';
import { BenchFault } from '../../app/contract';
import { createVirtualLogger, parseFaults, type FaultName, type VirtualLogger } from '../../app/sim';
import { faultsStillActing } from '../../app/sim/fittedBoard';
import type { ResistorRole } from '../../app/board/trimCandidates';
import type { LineSink } from './liveLink';


export interface VirtualSourceOptions {
  design: BoardDesign;
  faults: readonly string[];
  control?: VirtualControl;
  /** Times real time when paced by the timer (default 1). */
  speed?: number;
  seed?: number;
  /** Pace by a timer (default true); false: only `pump` moves the signal on. */
  paced?: boolean;
  /** Timer period (ms, default 50). */
  tickMs?: number;
}

export interface VirtualSource {
  readonly description: LinkSource;
  start(sink: LineSink): void;
  stop(): void;
  /** Produces `seconds` of signal now, in steps of `stepS`. */
  pump(seconds: number, stepS?: number): void;
  setControl(control: VirtualControl): void;
  /**
   * The technician changed a resistor position: a replacement puts `ohm` there (and takes out a wrong part);
   * a parallel or series resistor `addOhm` combines with the part actually fitted, which may not be the design's.
   */
  fitResistor(part: ResistorRole, change: { method: 'replace' | 'parallel' | 'series'; toOhm: number; addOhm: number | null }): number;
  /** The technician replaced the ramp capacitor: `farad` there from now on (and the wrong part taken out). */
  fitCapacitor(farad: number): number;
  /** What a meter reads at a position on the virtual board: the part actually fitted there (ohm; farad for cRamp). */
  partValue(part: PartRole): number;
  /** The technician replaced the ramp transistor with one of the design's type (the virtual board has no transistor fault, so nothing changes). */
  fitTransistor(): void;
  control(): VirtualControl | null;
}


export function createVirtualSource(options: VirtualSourceOptions): VirtualSource {
  let design = options.design;
  const faults = [...options.faults];
  // Checked now, so a typo in a fault name is an expected fault at connect, not a crash later.
  const parsed = parseFaults(faults, 'faults');
  let control: VirtualControl | null = options.control ?? null;
  const speed = options.speed ?? 1;
  const tickMs = options.tickMs ?? 50;
  let sink: LineSink | null = null;
  let timer: ReturnType<typeof setInterval> | null = null;
  let logger: VirtualLogger;
  let signalS = 0;
  let ended = false;
  // Positions where a part was fitted since the start: the board's part faults no longer touch them.
  const replaced = new Set<PartRole>();

  const build = (): void => {
    const controlOptions = control === null ? {} : control.mode === 'fixed' ? { controlV: control.controlV } : { controlSweep: { fromV: control.fromV, toV: control.toV, periodS: control.periodS } };
    logger = createVirtualLogger(design, { faults: faults as FaultName[], replacedParts: [...replaced], seed: options.seed ?? 1, unplugAfterS: parsed.unplugAfterS ?? undefined, ...controlOptions });
    signalS = 0;
  };
  build();

  const advance = (seconds: number): void => {
    if (!sink || ended) return;
    signalS += seconds;
    const lines = logger.linesUntil(signalS);
    if (lines.length > 0) sink.lines(lines);
    if (logger.isUnplugged()) {
      ended = true;
      sink.ended('the virtual logger went silent (unplug fault)');
    }
  };

  // The faults a replaced part took out no longer describe the board.
  const description = (): LinkSource => ({ kind: 'virtual', designName: design.name, faults: faultsStillActing(faults, [...replaced]) });

  return {
    get description() {
      return description();
    },
    start(target) {
      sink = target;
      if (options.paced ?? true) timer = setInterval(() => advance((tickMs / 1000) * speed), tickMs);
    },
    stop() {
      if (timer) clearInterval(timer);
      timer = null;
      sink = null;
    },
    pump(seconds, stepS = 0.05) {
      for (let done = 0; done < seconds - 1e-9; done += stepS) advance(Math.min(stepS, seconds - done));
    },
    setControl(next) {
      control = next;
      build();
    },
    fitResistor(part, change) {
      const current = design.parts[part];
      if (!current) throw new BenchFault('input', `the design has no ${partName(design, part)}`, part);
      // The value actually on the board: the fault's wrong part when one is fitted there.
      const actualOhm = logger.board.fitted.partOverrides[part] ?? current.ohm;
      let ohm = change.toOhm;
      if (change.method !== 'replace') {
        if (change.addOhm === null || !(change.addOhm > 0)) throw new BenchFault('input', `a ${change.method} change needs the added resistor's value`, 'addOhm');
        ohm = change.method === 'parallel' ? (actualOhm * change.addOhm) / (actualOhm + change.addOhm) : actualOhm + change.addOhm;
      }
      if (!(ohm > 0) || !Number.isFinite(ohm)) throw new BenchFault('input', `a fitted resistor must be above 0 ohm (got ${ohm})`, part);
      design = { ...design, parts: { ...design.parts, [part]: { ...current, ohm } } };
      replaced.add(part);
      build();
      return ohm;
    },
    fitCapacitor(farad) {
      if (!(farad > 0) || !Number.isFinite(farad)) throw new BenchFault('input', `a fitted capacitor must be above 0 F (got ${farad})`, 'toFarad');
      design = { ...design, parts: { ...design.parts, cRamp: { ...design.parts.cRamp, farad } } };
      replaced.add('cRamp');
      build();
      return farad;
    },
    fitTransistor() {
      build();
    },
    partValue(part) {
      const fitted = logger.board.fitted;
      const value = fitted.partOverrides[part] ?? designValueOf(design, part);
      if (value === null || value === undefined) throw new BenchFault('input', `the design has no ${partName(design, part)}`, part);
      return value;
    },
    control: () => control,
  };
}
