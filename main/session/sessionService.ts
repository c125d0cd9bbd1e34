/**
 * The session service: the bench API contract implemented once over the core. It owns the link (virtual board or
 * serial logger), measures what arrives (benchPipeline), records the open session in the logbook (batched by the
 * store's writer, so the link never waits on the disk), and sends throttled live frames to the screens.
 */
import type { BoardDesign } from '../../app/board/design';
import { BenchFault, commissioningStepNames, describeLinkSource, type BenchState, type SessionRow, type StepReport, type EventData, type LinkHealth, type PortInfo, type TransferPoint } from '../../app/contract';
import type { Logbook, SessionSignOff } from '../store/logbookTypes';
import { checkSessionStep, currentStep, recordMeasurements, saveRecordedSteps, stepInputsOf, type BenchSession } from './benchSession';
import type { BenchPipelineOptions, PipelineStep } from './benchPipeline';
import type { DesignCatalog } from './designCatalog';
import { createBenchEventHub, type BenchEventListener, type BenchEventSource, type BenchHandlers } from './handlers';
import { createLiveLink, disconnectedHealth, type LineSource } from './liveLink';
import { sessionRowView } from './logbookViews';
import type { SessionExporter } from './exporters';
import { createRecallHandlers } from './recallHandlers';
import type { SharePusher } from '../share/sharePusher';
import { createTrimHandlers, type CurrentLink } from './trimHandlers';
import { stepReports } from './steps';
import { normalisedReason, reasonProblem, signOffExceptionText, signOffGateOf } from '../../app/bench/signOffGate';
import { createThrottle, systemClock, type ClockLike } from './throttle';
import { createVirtualSource, type VirtualSource } from './virtualSource';
import { createCaptureHandlers } from './captureHandlers';
import { forTheScreen, readOptionsOf } from './captureInspect';
import { isInputError } from '../../app/errors';
import { openCaptureSource } from './captureSource';
import { createCaptureUploads } from './captureUploads';
import { mergeBlocks } from './sampleRing';

/** Serial loggers, as main/serial offers them. */
export interface SerialAccess {
  listPorts(): Promise<PortInfo[]>;
  open(path: string, options: { baudRate?: number }): Promise<LineSource>;
}

export interface SessionServiceOptions {
  logbook: Logbook;
  designs: DesignCatalog;
  serial?: SerialAccess | null;
  exporters?: readonly SessionExporter[];
  /** The bench's name in the logbook (default: the RAMPWRIGHT_BENCH setting or the host name). */
  bench?: string;
  /** Pushes finished sessions to a shared logbook (serve --push-to); its status is the `sharing` call. */
  sharing?: SharePusher | null;
  /**
   * False when the logbook is a shared one served for viewing: sessions are recorded into a bench's own logbook file
   * first (a server that goes away must never cost a live session) and pushed from there.
   */
  recordsSessions?: boolean;
  /** Live frames at most this often (ms, default 50: 20 a second). */
  liveIntervalMs?: number;
  pipeline?: BenchPipelineOptions;
  /** Pace the virtual board by a timer (default true); false leaves it to `virtual().pump` (demo, tests). */
  virtualPaced?: boolean;
  clock?: ClockLike;
}

export interface SessionService {
  handlers: BenchHandlers;
  events: BenchEventSource;
  /** The virtual board of the current link, when it is one. */
  virtual(): VirtualSource | null;
  /** Sends an event from outside the service (the desktop menu's commands). */
  emit: BenchEventListener;
  close(): Promise<void>;
}

type Current = CurrentLink;

export function createSessionService(options: SessionServiceOptions): SessionService {
  const { logbook, designs } = options;
  const hub = createBenchEventHub();
  const clock = options.clock ?? systemClock;
  const uploads = createCaptureUploads();
  let current: Current | null = null;
  let session: BenchSession | null = null;
  let held = false;
  /** Counts state changes; live frames carry it so a screen can tell a frame from before a change (see the contract). */
  let stateSerial = 0;
  let lastSession: BenchState['lastSession'] = null;
  /** Keeps the session just closed, with its steps as recorded, for the Bench screen's summary. */
  const keepClosed = (closed: BenchSession, row: SessionRow): void => {
    lastSession = { row, steps: commissioningStepNames.map((step) => closed.recorded[step]).filter((report): report is StepReport => report !== undefined) };
  };

  const health = (): LinkHealth => current?.link.health() ?? disconnectedHealth();
  const stateOf = (): BenchState => {
    // Steps need a design to judge against: the session's, else the open link's; with neither there are none.
    const design = session?.design ?? current?.design ?? null;
    return {
      session: session?.open ?? null,
      link: health(),
      held,
      steps: design ? stepReports(stepInputsOf(session, design, current?.link.pipeline ?? null)) : [],
      currentStep: currentStep(session),
      recheckNeeded: session?.recheckNeeded ?? false,
      signOffGate: signOffGateOf(session?.recorded ?? {}),
      lastSession,
      stateSerial,
    };
  };
  const emitState = () => {
    stateSerial += 1;
    hub.emit('state', stateOf());
  };

  /** Transfer points since the last live frame: sent in one batch with it (also while the plot is held). */
  let pendingTransfer: TransferPoint[] = [];
  const live = createThrottle<null>(
    () => {
      if (pendingTransfer.length > 0) {
        hub.emit('transfer', { sessionId: session?.open.id ?? null, points: pendingTransfer });
        pendingTransfer = [];
      }
      if (!current || held) return;
      const inputs = stepInputsOf(session, session?.design ?? current.design, current.link.pipeline);
      const frame: EventData<'live'> = { sessionId: session?.open.id ?? null, t: current.link.pipeline.newestS(), fold: current.link.pipeline.fold(), steps: stepReports(inputs), link: current.link.health(), stateSerial };
      hub.emit('live', frame);
    },
    options.liveIntervalMs ?? 50,
    clock,
  );
  let lastHealthMs = Number.NEGATIVE_INFINITY;

  // Once a second while a link is open: health for the screens even when nothing arrives, and a link that has
  // gone quiet for over 2 s shown as stalled (the serial watchdog gives it up later; some platforms never say).
  let heartbeat: ReturnType<typeof setInterval> | null = null;
  // A logbook that refuses writes (disk full, file read-only or damaged) is said once per session, in words.
  let storageWarnedFor: BenchSession | null = null;
  const beat = (): void => {
    const failure = session?.writer.stats().writeFailure ?? null;
    if (session && failure && storageWarnedFor !== session) {
      storageWarnedFor = session;
      hub.emit('notice', { level: 'warning', message: `${failure.message}: what the bench measures now is not being recorded; what was stored is kept` });
    }
    if (!current) return;
    const now = current.link.health();
    if (now.state === 'streaming' && now.lastDataAgoMs !== null && now.lastDataAgoMs > 2000) current.link.setState('stalled', `no data for ${(now.lastDataAgoMs / 1000).toFixed(1)} s`);
    hub.emit('health', current.link.health());
  };

  const attach = (source: LineSource, design: BoardDesign, virtual: VirtualSource | null): void => {
    const link = createLiveLink(source, design, { pipeline: options.pipeline, now: () => clock.now() });
    const attached: Current = { link, design, virtual };
    current = attached;
    if (heartbeat === null && (options.virtualPaced ?? true)) {
      heartbeat = setInterval(beat, 1000);
      heartbeat.unref();
    }
    const measured = (step: PipelineStep): void => {
      if (session) recordMeasurements(session, step.cycles, step.problems);
      if (step.cycles.length > 0 || step.window) live.offer(null);
      if (clock.now() - lastHealthMs >= 1000) {
        lastHealthMs = clock.now();
        hub.emit('health', attached.link.health());
      }
      for (const cycle of step.cycles) {
        if (cycle.controlV !== null && cycle.alphaDeg !== null) pendingTransfer.push({ t: cycle.t, controlV: cycle.controlV, alphaDeg: cycle.alphaDeg });
      }
    };
    source.start({
      lines: (lines) => {
        if (current === attached) measured(attached.link.receive(lines));
      },
      blocks: (blocks) => {
        if (current === attached) measured(attached.link.receiveBlocks(blocks));
      },
      finished: (detail) => {
        if (current !== attached) return;
        attached.link.setState('ended', detail);
        live.offer(null);
        hub.emit('health', attached.link.health());
        hub.emit('notice', { level: 'info', message: `Capture read to the end (${detail}): record the steps from its readings.` });
      },
      event: (kind, detail, state) => {
        if (current !== attached) return;
        if (state) attached.link.setState(state, detail);
        session?.writer.addLinkEvent(kind, detail);
        hub.emit('health', attached.link.health());
        if (kind === 'unplugged' || kind === 'reopened' || kind === 'watchdog-timeout') hub.emit('notice', { level: kind === 'reopened' ? 'info' : 'warning', message: `link ${kind.replace('-', ' ')}: ${detail}` });
      },
      ended: (reason) => {
        if (current !== attached) return;
        attached.link.setState('lost', reason);
        session?.writer.addLinkEvent('unplugged', reason);
        hub.emit('health', attached.link.health());
        hub.emit('notice', { level: 'warning', message: `link lost: ${reason}` });
      },
    });
  };

  const detach = async (): Promise<void> => {
    if (!current) return;
    const leaving = current;
    current = null;
    live.stop();
    pendingTransfer = [];
    if (heartbeat !== null) clearInterval(heartbeat);
    heartbeat = null;
    await leaving.link.source.stop();
    const left = leaving.link.source.description;
    session?.writer.addLinkEvent('closed', `link to ${left.kind === 'serial' ? left.path : left.kind === 'capture' ? `the capture file ${left.fileName}` : 'the virtual board'} closed`);
  };

  /** Analysis follows the session's design; a link opened for another design is re-measured against it. */
  const followDesign = (design: BoardDesign): void => {
    if (!current || current.design === design) return;
    current.link.pipeline.retarget(design);
    current.design = design;
  };

  const requireSession = (): BenchSession => {
    if (!session) throw new BenchFault('not-ready', 'no session is open: start one with the unit serial, the design and your name');
    return session;
  };
  const requireLink = (): Current => {
    if (!current) throw new BenchFault('not-ready', 'no link is open: connect the logger or start the virtual board');
    return current;
  };

  const handlers: BenchHandlers = {
    ...createRecallHandlers({ logbook, designs, exporters: options.exporters ?? [], sharing: options.sharing ?? null }),
    async listPorts() {
      return { ports: options.serial ? await options.serial.listPorts() : [] };
    },
    async connect(payload) {
      await detach();
      if (payload.kind === 'virtual') {
        const design = payload.design ?? (await designs.get(payload.designName as string)).design;
        const virtual = createVirtualSource({ design, faults: payload.faults, control: payload.control, speed: payload.speed, seed: payload.seed, paced: options.virtualPaced ?? true });
        attach(virtual, session?.design ?? design, virtual);
      } else if (payload.kind === 'capture') {
        const design = session?.design ?? (payload.designName ? (await designs.get(payload.designName)).design : null);
        if (!design) throw new BenchFault('not-ready', 'pick the board design first, so the analysis knows the board the capture is of', 'designName');
        const upload = uploads.get(payload.uploadId);
        const fileName = upload.files.map((file) => file.name).join(' + ');
        const source = await openCaptureSource({
          path: upload.mainPath,
          fileName,
          read: readOptionsOf(payload.fields, design),
          speed: payload.speed,
          onProgress: (progress) => hub.emit('captureProgress', progress),
        }).catch((error: unknown) => {
          if (!isInputError(error)) throw error;
          // In the screen's words: the form's fields, not the command line's options.
          const screen = forTheScreen(error.message);
          throw new BenchFault('input', screen.message, screen.field ?? undefined);
        });
        attach(source, design, null);
      } else {
        if (!options.serial) throw new BenchFault('not-available', 'serial loggers are not available in this build');
        const design = session?.design ?? null;
        if (!design) throw new BenchFault('not-ready', 'start the session first (unit, design, operator), so the analysis knows the board it measures');
        const source = await options.serial.open(payload.path, { baudRate: payload.baudRate });
        attach(source, design, null);
      }
      session?.writer.addLinkEvent('opened', current ? `link to the ${describeLinkSource(current.link.source.description)} opened` : '');
      emitState();
      return health();
    },
    async disconnect() {
      await detach();
      emitState();
      return health();
    },
    async setVirtualControl(control) {
      const link = requireLink();
      if (!link.virtual) throw new BenchFault('not-ready', 'the control voltage can be set on the virtual board only; turn the pot on a real board');
      link.virtual.setControl(control);
      return { control };
    },
    async startSession({ unitSerial, designName, operator, notes }) {
      if (options.recordsSessions === false) {
        throw new BenchFault('not-available', 'this shows the shared logbook: a bench records sessions into its own logbook file and pushes them here (serve --db <file> --push-to <address>)');
      }
      if (session) throw new BenchFault('not-ready', `session ${session.open.id} for unit ${session.open.unitSerial} is still open: sign it off or stop it first`);
      const stored = await designs.get(designName);
      const writer = await logbook.startSession({ unitSerial, design: stored.design, operator, notes, bench: options.bench });
      const startedAt = new Date().toISOString();
      session = {
        open: { id: writer.sessionId, unitSerial, designName: stored.summary.name, designVersion: stored.summary.version, operator, startedAt },
        design: stored.design,
        writer,
        recorded: {},
        recheckNeeded: false,
        trimsApplied: 0,
        signedOff: false,
        knownParts: {},
      };
      lastSession = null;
      followDesign(stored.design);
      if (current) writer.addLinkEvent('opened', `link to the ${describeLinkSource(current.link.source.description)} opened`);
      emitState();
      return session.open;
    },
    async stopSession({ notes }) {
      const open = requireSession();
      if (notes) open.writer.setNotes(notes);
      session = null;
      const row = sessionRowView(await open.writer.close('closed'));
      keepClosed(open, row);
      emitState();
      return row;
    },
    benchState: async () => stateOf(),
    async setHold({ held: next }) {
      held = next;
      emitState();
      return { held };
    },
    async keepCapture({ seconds, label }) {
      const open = requireSession();
      const link = requireLink();
      const blocks = link.link.pipeline.lastSeconds(seconds);
      if (blocks.length === 0) throw new BenchFault('not-ready', 'no samples have arrived yet to keep');
      const merged = mergeBlocks(blocks);
      open.writer.addCapture(merged, label);
      await open.writer.flush();
      const detail = await logbook.session(open.open.id);
      const kept = detail?.captures[detail.captures.length - 1];
      if (!kept) throw new Error('the kept capture did not reach the logbook');
      return { captureId: kept.id, seconds: kept.seconds };
    },
    async checkStep({ step }) {
      const open = requireSession();
      if (step === 'sign-off') throw new BenchFault('input', 'sign off with the sign-off action, which also closes the session', 'step');
      const link = requireLink();
      const outcome = checkSessionStep(open, link.link.pipeline, step);
      if ('refused' in outcome) throw new BenchFault('not-ready', outcome.refused, 'step');
      await open.writer.flush();
      emitState();
      return outcome.recorded;
    },
    async signOff({ notes, exceptionsReason }) {
      const open = requireSession();
      // The gate: every step recorded and within tolerance, or an explicit sign-off with exceptions and a reason.
      const gate = signOffGateOf(open.recorded);
      let signOff: SessionSignOff = { kind: 'signed-off' };
      if (!gate.clear) {
        const listed = gate.exceptions.map(signOffExceptionText).join('; ');
        if (exceptionsReason === undefined) {
          throw new BenchFault('not-ready', `sign-off refused: ${listed}. Record the missing steps, or sign off with exceptions and write why`, 'exceptionsReason');
        }
        const problem = reasonProblem(exceptionsReason);
        if (problem) throw new BenchFault('input', `${problem}; the exceptions are: ${listed}`, 'exceptionsReason');
        signOff = { kind: 'signed-off-with-exceptions', reason: normalisedReason(exceptionsReason), exceptions: gate.exceptions };
      }
      open.signedOff = true;
      const inputs = stepInputsOf(open, open.design, current?.link.pipeline ?? null);
      const report = stepReports(inputs).find((step) => step.step === 'sign-off');
      if (report) open.recorded['sign-off'] = { ...report, status: 'done' };
      saveRecordedSteps(open);
      if (notes) open.writer.setNotes(notes);
      session = null;
      const row = sessionRowView(await open.writer.close('closed', signOff));
      keepClosed(open, row);
      emitState();
      return row;
    },
    ...createCaptureHandlers({ uploads, designs }),
    ...createTrimHandlers({ logbook, designs, session: () => session, link: () => current, requireSession, requireLink, emitState }),
  };

  return {
    handlers,
    events: hub,
    virtual: () => current?.virtual ?? null,
    emit: hub.emit,
    async close() {
      await detach();
      uploads.close();
      if (session) {
        const open = session;
        session = null;
        await open.writer.close('interrupted');
      }
    },
  };
}
