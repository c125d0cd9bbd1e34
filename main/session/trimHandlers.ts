/**
 * The trim and transfer calls of the session service: the trim plan from the last window's ramp, "I fitted this"
 * (recorded, fitted to the virtual board, re-check asked for), and the transfer curve so far.
 */
import type { BoardDesign } from '../../app/board/design';
import type { ResistorRole } from '../../app/board/trimCandidates';
import { BenchFault } from '../../app/contract';
import type { Logbook } from '../store/logbookTypes';
import type { BenchSession } from './benchSession';
import type { DesignCatalog } from './designCatalog';
import type { BenchHandlers } from './handlers';
import type { LiveLink } from './liveLink';
import { idealTransfer } from './steps';
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

export function createTrimHandlers(context: TrimHandlerContext): Pick<BenchHandlers, 'trimPlan' | 'applyTrim' | 'transferPoints' | 'clearTransfer'> {
  const { logbook, designs, requireSession, requireLink, emitState } = context;
  return {
    async trimPlan({ series }) {
      const link = requireLink();
      const design = context.session()?.design ?? link.design;
      const window = link.link.pipeline.lastWindow();
      const plan = planFromWindow(design, window, series);
      const fold = link.link.pipeline.fold();
      return trimPlanView(design, plan, window, fold.length > 0 ? fold[fold.length - 1].ramp : null);
    },
    async applyTrim({ part, fromOhm, toOhm, method, addOhm, reason }) {
      const open = requireSession();
      const design = open.design;
      if (!(part in design.parts) || part === 'cRamp') throw new BenchFault('input', `"${part}" is not a resistor position of the design ${design.name}`, 'part');
      const methodWords = method === 'replace' ? 'replaced' : `${addOhm ?? '?'} ohm added in ${method}`;
      open.writer.addTrim({ part, fromOhm, toOhm, method: `trim plan: ${methodWords}`, reason });
      open.trimsApplied += 1;
      open.recheckNeeded = true;
      delete open.recorded.ramp;
      delete open.recorded.trim;
      // The virtual board gets the part; a real board got it from the technician's soldering iron.
      context.link()?.virtual?.fitResistor(part as ResistorRole, { method, toOhm, addOhm });
      context.link()?.link.pipeline.restartReadings();
      await open.writer.flush();
      const detail = await logbook.session(open.open.id);
      const trim = detail?.trims[detail.trims.length - 1];
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
        return { points: detail.transfer.points, fit: detail.transfer.fit, ideal: stored ? idealTransfer(stored.design) : [] };
      }
      const pipeline = requireLink().link.pipeline;
      return { points: pipeline.transferPoints(), fit: pipeline.transferFit(), ideal: design ? idealTransfer(design) : [] };
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
