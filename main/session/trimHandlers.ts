/**
 * The trim and transfer calls of the session service: the trim plan from the last window's ramp, "I fitted this"
 * (recorded, fitted to the virtual board, re-check asked for), and the transfer curve so far.
 */
import { controlRangeOf } from '../../app/board/controlRange';
import type { BoardDesign } from '../../app/board/design';
import { formatOhm } from '../../app/board/formatValues';
import { checkMeasuredParts } from '../../app/board/measuredParts';
import { partName } from '../../app/board/partNames';
import type { ResistorRole } from '../../app/board/trimCandidates';
import { BenchFault } from '../../app/contract';
import type { Logbook } from '../store/logbookTypes';
import { saveRecordedSteps, type BenchSession } from './benchSession';
import type { DesignCatalog } from './designCatalog';
import type { BenchHandlers } from './handlers';
import type { LiveLink } from './liveLink';
import { idealTransfer } from './steps';
import { type KnownParts, knownPartViews, newMeasurements, overridesOf, withFitted, withMeasured } from './knownParts';
import { planFromWindow, trimPlanView } from './trimView';
import type { VirtualSource } from './virtualSource';

export interface CurrentLink {
  link: LiveLink;
  design: BoardDesign;
  virtual: VirtualSource | null;
}

export interface TrimHandlerContext {
  logbook: Logbook;
  designs: DesignCatalog;
  session(): BenchSession | null;
  link(): CurrentLink | null;
  requireSession(): BenchSession;
  requireLink(): CurrentLink;
  emitState(): void;
}

function rangeView(design: BoardDesign): { lowV: number; highV: number; alphaAtLowDeg: number | null; alphaAtHighDeg: number | null } {
  const { lowV, highV, alphaAtLowDeg, alphaAtHighDeg } = controlRangeOf(design);
  return { lowV, highV, alphaAtLowDeg, alphaAtHighDeg };
}

export function createTrimHandlers(context: TrimHandlerContext): Pick<BenchHandlers, 'trimPlan' | 'applyTrim' | 'transferPoints' | 'clearTransfer'> {
  const { logbook, designs, requireSession, requireLink, emitState } = context;
  return {
    async trimPlan({ series, measuredParts }) {
      const link = requireLink();
      const open = context.session();
      const design = open?.design ?? link.design;
      const measured = measuredParts === undefined ? null : checkMeasuredParts(design, measuredParts, 'measuredParts');
      // The session remembers what it was told; without a session the values serve this one plan.
      let known: KnownParts = open?.knownParts ?? {};
      if (measured !== null) {
        // A value new to the session, or measured again to a different figure, goes into the logbook.
        for (const change of newMeasurements(design, known, measured)) open?.writer.addPartMeasurement(change);
        known = withMeasured(known, measured);
      }
      if (open) open.knownParts = known;
      const window = link.link.pipeline.lastWindow();
      const plan = planFromWindow(design, window, series, overridesOf(known), overridesOf(known, 'measured'));
      const fold = link.link.pipeline.fold();
      return trimPlanView(design, plan, window, fold.length > 0 ? fold[fold.length - 1].ramp : null, knownPartViews(design, known));
    },
    async applyTrim({ part, fromOhm, toOhm, fromFarad, toFarad, method, addOhm, reason, alsoChange }) {
      const open = requireSession();
      const design = open.design;
      const resistorPosition = (name: string, field: string): ResistorRole => {
        if (!(name in design.parts) || name === 'cRamp') throw new BenchFault('input', `"${name}" is not a resistor position of the design ${design.name}`, field);
        return name as ResistorRole;
      };
      // "I fitted this" once per plan: the next change is planned from the ramp as the last one left it.
      if (open.recheckNeeded) throw new BenchFault('not-ready', 'a change was already recorded and the ramp not checked since: record the ramp step again, then plan the next change from the ramp as it is', 'part');
      const virtual = context.link()?.virtual;
      let recorded: { part: string; fromValue: number; toValue: number; method: string };
      let second: { role: ResistorRole; fromOhm: number; toOhm: number } | null = null;
      if (part === 'transistor' || part === 'cRamp') {
        // A part put back to its design value: the ramp transistor, or the ramp capacitor (values in farad).
        if (method !== 'replace') throw new BenchFault('input', `the ${partName(design, part)} can only be replaced`, 'method');
        if (alsoChange) throw new BenchFault('input', `the ${partName(design, part)} is replaced on its own`, 'alsoChange');
        if (part === 'cRamp') {
          if (toFarad === null) throw new BenchFault('input', 'a new ramp capacitor needs its value in farad (toFarad)', 'toFarad');
          recorded = { part, fromValue: fromFarad ?? open.knownParts.cRamp?.value ?? design.parts.cRamp.farad, toValue: toFarad, method: 'trim plan: replaced' };
          virtual?.fitCapacitor(toFarad);
          open.knownParts = withFitted(open.knownParts, 'cRamp', toFarad);
        } else {
          recorded = { part, fromValue: 0, toValue: 0, method: 'trim plan: replaced' };
          virtual?.fitTransistor();
        }
      } else {
        const first = resistorPosition(part, 'part');
        if (fromOhm === null || toOhm === null) throw new BenchFault('input', `a change of the ${partName(design, first)} needs fromOhm and toOhm`, fromOhm === null ? 'fromOhm' : 'toOhm');
        second = alsoChange ? { ...alsoChange, role: resistorPosition(alsoChange.part, 'alsoChange.part') } : null;
        if (second?.role === first) throw new BenchFault('input', `the second change must be at another position than the ${partName(design, first)}`, 'alsoChange.part');
        const methodWords = method === 'replace' ? 'replaced' : `${addOhm === null ? '?' : formatOhm(addOhm)} added in ${method}`;
        recorded = { part: first, fromValue: fromOhm, toValue: toOhm, method: `trim plan: ${methodWords}` };
        // The virtual board gets the parts (and refuses a change it cannot make before anything is recorded); a
        // real board got them from the technician's soldering iron.
        virtual?.fitResistor(first, { method, toOhm, addOhm });
        if (second) virtual?.fitResistor(second.role, { method: 'replace', toOhm: second.toOhm, addOhm: null });
        open.knownParts = withFitted(open.knownParts, first, toOhm);
        if (second) open.knownParts = withFitted(open.knownParts, second.role, second.toOhm);
      }
      open.writer.addTrim({ part: recorded.part, fromOhm: recorded.fromValue, toOhm: recorded.toValue, method: recorded.method, reason });
      if (second) open.writer.addTrim({ part: second.role, fromOhm: second.fromOhm, toOhm: second.toOhm, method: 'trim plan: replaced (with the change above)', reason });
      open.trimsApplied += 1;
      open.recheckNeeded = true;
      delete open.recorded.ramp;
      delete open.recorded.trim;
      // The logbook forgets them too: a ramp recorded before the change no longer describes the board.
      saveRecordedSteps(open);
      context.link()?.link.pipeline.restartReadings();
      await open.writer.flush();
      const detail = await logbook.session(open.open.id);
      // The first of the rows just written (the second change, when there is one, follows it).
      const trim = detail?.trims[detail.trims.length - (second ? 2 : 1)];
      if (!trim) throw new Error('the fitted change did not reach the logbook');
      emitState();
      return { trim: { id: trim.id, part: trim.part, fromOhm: trim.fromOhm, toOhm: trim.toOhm, reason: trim.reason, at: trim.at }, recheckNeeded: true };
    },
    async transferPoints({ sessionId }) {
      const link = context.link();
      const design = context.session()?.design ?? link?.design ?? null;
      if (sessionId !== undefined && sessionId !== context.session()?.open.id) {
        const detail = await logbook.session(sessionId);
        if (!detail) throw new BenchFault('not-found', `there is no session ${sessionId} in the logbook`, 'sessionId');
        const stored = await designs.get(detail.row.designName, detail.row.designVersion).catch(() => null);
        return { points: detail.transfer.points, fit: detail.transfer.fit, ideal: stored ? idealTransfer(stored.design) : [], controlRange: stored ? rangeView(stored.design) : null };
      }
      const pipeline = requireLink().link.pipeline;
      return { points: pipeline.transferPoints(), fit: pipeline.transferFit(), ideal: design ? idealTransfer(design) : [], controlRange: design ? rangeView(design) : null };
    },
    async clearTransfer() {
      const pipeline = requireLink().link.pipeline;
      const cleared = pipeline.transferPoints().length;
      pipeline.restartReadings();
      emitState();
      return { cleared };
    },
  };
}
