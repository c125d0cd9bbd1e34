/**
 * Bench: the commissioning steps down the left; on the right the unit and session, large readings readable at arm's
 * length, the cycle fold, link health, and the Hold / Keep capture actions.
 */
import type { LiveFrame } from '../../app/contract/bench-events';
import { BenchCallError } from '../../app/contract/errors';
import { commissioningStepTitles as stepTitles, describeLinkSource, type CommissioningStep, type LinkHealth } from '../../app/contract/readings';
import { outcomeWords, type SessionRow, type SignOffException } from '../../app/contract/records';
import { verdictWords } from '../../app/contract/verdicts';
import type { CaptureProgress } from '../../app/contract/captureImport';
import { CycleFoldChart, type RampTarget } from '../charts/cycleFoldChart';
import { h, fill } from '../dom/h';
import { verdictBadge } from '../dom/verdictBadge';
import { formatFixed, formatReading, formatSi } from '../shaping/formatSi';
import { designText, mergeSteps, pickReading } from '../shaping/stepView';
import { runAction, type Screen, type ScreenContext } from '../shell/screen';
import { askExceptionsReason, confirmDecision } from './benchDialogs';
import { BenchSetup } from './benchSetup';
import { LastSessionPanel } from './lastSessionPanel';
import { StepList } from './stepList';

const bigReadingKeys: readonly { title: string; keys: string[] }[] = [
  { title: 'Mains frequency', keys: ['frequencyHz'] },
  { title: 'Ramp peak', keys: ['rampPeakV', 'peakV'] },
  { title: 'Firing angle α', keys: ['alphaDeg', 'alphaMeanDeg'] },
  { title: 'Pulse width', keys: ['widthUs', 'pulseWidthUs'] },
];

export class BenchScreen implements Screen {
  readonly name = 'bench' as const;
  readonly title = 'Bench';
  readonly element: HTMLElement;
  private readonly setup: BenchSetup;
  private readonly steps: StepList;
  private readonly fold: CycleFoldChart;
  private readonly canvas = h('canvas', { role: 'img', 'aria-label': 'Cycle fold: no cycles yet', 'data-testid': 'fold-canvas' });
  private readonly heldBadge = h('span', { class: 'held-badge', hidden: true }, 'Held');
  private readonly bigReadings = h('div', { class: 'big-readings', 'aria-live': 'off' });
  private readonly linkPanel = h('div', { class: 'link-health', 'data-testid': 'link-health' });
  private readonly captureBar = h('progress', { max: 1, value: 0, 'data-testid': 'capture-progress' });
  private readonly captureText = h('span', { class: 'muted', 'data-testid': 'capture-progress-text' });
  private readonly cancelButton = h('button', { class: 'secondary', type: 'button', 'data-testid': 'capture-cancel' }, 'Stop reading');
  private readonly captureRow = h('div', { class: 'row capture-reading', hidden: true }, h('span', {}, 'Capture file'), this.captureBar, this.captureText, this.cancelButton);
  private readonly sessionLine = h('div', { class: 'row', 'data-testid': 'session-line' });
  private readonly foldCaption = h('span', { class: 'muted', 'data-testid': 'fold-caption' }, 'No cycles yet');
  private readonly holdButton = h('button', { class: 'secondary', type: 'button', 'aria-pressed': 'false', 'data-testid': 'hold' }, 'Hold');
  private readonly keepButton = h('button', { class: 'secondary', type: 'button', 'data-testid': 'keep-capture' }, 'Keep capture');
  private readonly stopButton = h('button', { class: 'secondary', type: 'button', 'data-testid': 'stop-session' }, 'Close session without sign-off');
  private readonly sessionArea: HTMLElement;
  private readonly stepsSection: HTMLElement;
  private readonly lastSession: LastSessionPanel;
  private readonly noSession = h('section', { class: 'panel muted', 'data-testid': 'no-session-steps' }, 'No session open: the commissioning steps and their verdicts appear once a session is started for a unit.');
  private lastFrame: LiveFrame | null = null;
  /** Readings text is redrawn a few times a second, the fold every frame: numbers that flicker cannot be read. */
  private lastTextRenderMs = 0;
  private hadSession = false;

  constructor(private readonly context: ScreenContext) {
    this.setup = new BenchSetup(context);
    this.steps = new StepList({
      check: (step, button) => void this.check(step, button),
      open: (step) => context.go(step === 'trim' ? 'trim' : 'transfer'),
      select: (step) => context.store.selectStep(step),
    });
    this.holdButton.addEventListener('click', () => this.toggleHold());
    this.keepButton.addEventListener('click', () => this.keepCapture());
    this.stopButton.addEventListener('click', () => void this.closeWithoutSignOff());
    this.lastSession = new LastSessionPanel(context);
    this.stepsSection = h('section', { 'aria-label': 'Commissioning steps' }, this.steps.element);
    const plot = h('div', { class: 'plot' }, this.canvas);
    this.fold = new CycleFoldChart(this.canvas);
    this.sessionArea = h(
      'div',
      { class: 'bench' },
      h('div', { class: 'stack' }, this.stepsSection, this.lastSession.element, this.noSession),
      h(
        'div',
        { class: 'bench-main' },
        h('section', { class: 'panel', 'aria-label': 'Unit and session' }, this.sessionLine),
        this.bigReadings,
        h(
          'section',
          { class: 'panel plot-panel', 'aria-labelledby': 'fold-title' },
          h('h2', { id: 'fold-title' }, 'Cycle fold'),
          this.heldBadge,
          plot,
          h(
            'div',
            { class: 'plot-caption' },
            ...(['sync', 'ramp', 'gate', 'control'] as const).map((role) => h('span', {}, h('span', { class: `swatch ${role}`, 'aria-hidden': 'true' }), role[0].toUpperCase() + role.slice(1))),
            h('span', {}, h('span', { class: 'swatch ramp', 'aria-hidden': 'true' }), 'dashed: ramp target and band'),
            this.foldCaption,
          ),
          h('div', { class: 'row' }, this.holdButton, this.keepButton, this.stopButton),
        ),
        h('section', { class: 'panel', 'aria-labelledby': 'link-title' }, h('h2', { id: 'link-title' }, 'Link health'), this.captureRow, this.linkPanel),
      ),
    );
    this.element = h('div', {}, h('h1', { class: 'screen-title visually-hidden' }, 'Bench'), this.setup.element, this.sessionArea);
    context.store.on('state', () => this.render());
    context.store.on('step', () => this.render());
    context.store.on('live', (frame) => this.onLive(frame as LiveFrame));
    context.store.on('health', (health) => this.renderLink(health as LinkHealth));
    context.store.on('captureProgress', (progress) => this.renderCaptureProgress(progress as CaptureProgress));
    this.cancelButton.addEventListener('click', () => void runAction(context, this.cancelButton, async () => {
      await context.client.disconnect();
      await context.store.refresh();
      context.notices.show('info', 'Reading of the capture stopped; what was read stays measured.');
    }));
  }

  shown(): void {
    if (!this.context.store.state?.session) void this.setup.load().catch((error) => this.context.notices.fromError(error));
    this.render();
    if (this.lastFrame) this.drawFold(this.lastFrame);
  }

  restyle(): void {
    this.fold.restyle();
  }

  /** Keyboard: Enter records the selected step. */
  checkSelected(): void {
    const button = this.element.querySelector<HTMLButtonElement>(`[data-testid="check-${this.context.store.selectedStep}"]`);
    if (button && !button.disabled) button.click();
  }

  toggleHold(): void {
    const held = !(this.context.store.state?.held ?? false);
    void runAction(this.context, this.holdButton, async () => {
      await this.context.client.setHold({ held });
      await this.context.store.refresh();
    });
  }

  keepCapture(): void {
    if (!this.context.store.state?.session) {
      this.context.notices.show('warning', 'Start a session before keeping a capture.');
      return;
    }
    void runAction(this.context, this.keepButton, async () => {
      const kept = await this.context.client.keepCapture({ seconds: 2 });
      this.context.notices.show('info', `Kept ${kept.seconds.toFixed(1)} s of samples as capture ${kept.captureId}.`);
    });
  }

  private async check(step: CommissioningStep, button: HTMLButtonElement): Promise<void> {
    if (step === 'sign-off') {
      await this.signOff(button);
      return;
    }
    await runAction(this.context, button, async () => {
      const report = await this.context.client.checkStep({ step });
      this.context.notices.show(report.verdict === 'out-of-tolerance' ? 'warning' : 'info', `${stepTitles[step]}: recorded, ${verdictWords[report.verdict].phrase}.`);
      await this.context.store.refresh();
      // On to the step the bench suggests next (the first not recorded), so the next Record button is at hand,
      // unless the technician chose another step while this one was being recorded: their choice stands.
      const next = this.context.store.state?.currentStep;
      if (next && next !== step && this.context.store.selectedStep === step) this.context.store.selectStep(next);
    });
  }

  /**
   * Sign off through the service's gate: a plain sign-off when every step is recorded and within tolerance; when it
   * refuses, the exceptions it listed and the choice to sign off with them and a written reason.
   */
  private async signOff(button: HTMLButtonElement): Promise<void> {
    button.disabled = true;
    try {
      // The service's gate as it stands now; the service applies it again at the call, whatever this screen shows.
      await this.context.store.refresh();
      const gate = this.context.store.state?.signOffGate;
      let row: SessionRow | null;
      try {
        row = gate && !gate.clear ? await this.signOffWithExceptions(gate.exceptions, 'sign-off refused') : await this.context.client.signOff({});
      } catch (error) {
        // Refused after all (a step changed in between): the same choice, with the service's own list.
        if (!(error instanceof BenchCallError && error.code === 'not-ready' && error.where === 'exceptionsReason')) throw error;
        await this.context.store.refresh();
        row = await this.signOffWithExceptions(this.context.store.state?.signOffGate.exceptions ?? [], error.message);
      }
      if (row === null) {
        this.context.notices.show('warning', 'Not signed off: the session stays open.');
        return;
      }
      this.context.notices.show(row.outcome === 'signed-off' ? 'info' : 'warning', `Unit ${row.unit} ${outcomeWords[row.outcome].phrase}; session ${row.id} is in the logbook.`);
      // The next session is the next unit: its serial number is typed afresh, never carried over from this one.
      this.setup.clearUnit();
      await this.context.store.refresh();
    } catch (error) {
      this.context.notices.fromError(error);
    } finally {
      button.disabled = false;
    }
  }

  /** The refusal with its exceptions, and the sign-off with them once a reason is written; null when the technician goes back. */
  private async signOffWithExceptions(exceptions: readonly SignOffException[], refusal: string): Promise<SessionRow | null> {
    const reason = await askExceptionsReason(exceptions, refusal);
    return reason === null ? null : this.context.client.signOff({ exceptionsReason: reason });
  }

  private async closeWithoutSignOff(): Promise<void> {
    const session = this.context.store.state?.session;
    if (!session) return;
    const sure = await confirmDecision({
      title: 'Close without sign-off?',
      text: `Session ${session.id} of unit ${session.unitSerial} ends as "closed without sign-off": its readings stay in the logbook, but the unit is not signed off and its record says so.`,
      confirm: 'Close without sign-off',
      cancel: 'Keep the session open',
      testId: 'confirm-close',
    });
    if (!sure) return;
    await runAction(this.context, this.stopButton, async () => {
      await this.context.client.stopSession({});
      await this.context.store.refresh();
      this.context.notices.show('info', 'Session closed without sign-off; it is in the logbook.');
    });
  }

  private onLive(frame: LiveFrame): void {
    this.lastFrame = frame;
    if (this.element.hidden) return; // not on screen: keep the frame, skip the drawing
    this.drawFold(frame);
    const nowMs = performance.now();
    if (nowMs - this.lastTextRenderMs < 400) return;
    this.lastTextRenderMs = nowMs;
    this.renderSteps();
    this.renderBigReadings();
  }

  private drawFold(frame: LiveFrame): void {
    const ramp = pickReading(frame.steps, ['rampPeakV', 'peakV']);
    const target: RampTarget | null = ramp && ramp.expected !== null ? { targetV: ramp.expected, lowV: ramp.low, highV: ramp.high } : null;
    this.fold.update(frame.fold, target);
    const alpha = pickReading(frame.steps, ['alphaDeg', 'alphaMeanDeg']);
    const summary = `${this.fold.cyclesShown} cycles overlaid${alpha?.value != null ? `, firing at ${formatFixed(alpha.value, '°')}` : ''}${ramp?.value != null ? `, ramp peak ${formatSi(ramp.value, 'V')}` : ''}`;
    this.foldCaption.textContent = summary;
    this.canvas.setAttribute('aria-label', `Cycle fold: ${summary}`);
    this.canvas.dataset.cycles = String(this.fold.cyclesShown);
  }

  private render(): void {
    const state = this.context.store.state;
    const session = state?.session ?? null;
    this.setup.element.hidden = session !== null;
    if (this.hadSession && !session) void this.setup.load().catch((error) => this.context.notices.fromError(error));
    this.hadSession = session !== null;
    this.sessionArea.hidden = false;
    fill(
      this.sessionLine,
      session
        ? [
            h('span', { class: 'chip' }, 'Unit ', h('strong', {}, session.unitSerial)),
            h('span', { class: 'chip' }, 'Design ', h('strong', {}, `${session.designName} v${session.designVersion}`)),
            h('span', { class: 'chip' }, 'Operator ', h('strong', {}, session.operator)),
            h('span', { class: 'chip', 'data-testid': 'session-id' }, `Session ${session.id} · open since ${new Date(session.startedAt).toLocaleTimeString()}`),
          ]
        : this.noSessionLine(),
    );
    const held = state?.held ?? false;
    this.holdButton.textContent = held ? 'Release hold' : 'Hold';
    this.holdButton.setAttribute('aria-pressed', String(held));
    this.heldBadge.hidden = !held;
    this.keepButton.disabled = !session;
    this.stopButton.hidden = !session;
    // Steps and their verdicts belong to an open session; without one the last session's record stands there.
    this.stepsSection.hidden = !session;
    this.lastSession.render(session ? null : (state?.lastSession ?? null));
    this.noSession.hidden = session !== null || (state?.lastSession ?? null) !== null;
    this.renderSteps();
    this.renderBigReadings();
    if (this.context.store.health) this.renderLink(this.context.store.health);
  }

  /**
   * Without a session the readings below are the link's as it is, which need not be the unit or the file being set
   * up (a capture file chosen above is read only when the session starts): the line says whose they are.
   */
  private noSessionLine(): HTMLElement {
    const source = this.context.store.health?.source ?? null;
    const whose = source ? ` The readings below come from the ${describeLinkSource(source)}; what is chosen above is read only once the session starts.` : '';
    return h('span', { class: 'muted', 'data-testid': 'no-session-line' }, `No session open. The fold shows the link when it streams; readings are recorded once a session is open.${whose}`);
  }

  private renderSteps(): void {
    const state = this.context.store.state;
    const rows = mergeSteps(state?.steps ?? [], this.context.store.liveSteps());
    this.steps.render(rows, this.context.store.selectedStep, !!state?.session, state?.recheckNeeded ?? false);
  }

  private renderBigReadings(): void {
    const steps = this.lastFrame?.steps ?? this.context.store.state?.steps ?? [];
    const sessionOpen = !!this.context.store.state?.session;
    fill(
      this.bigReadings,
      bigReadingKeys.map(({ title, keys }) => {
        const reading = pickReading(steps, keys);
        const newestFiring = this.lastFrame?.fold[this.lastFrame.fold.length - 1]?.firingDeg[0];
        if (!reading && keys[0] === 'alphaDeg' && newestFiring !== undefined) {
          // No judged reading while the control moves: show the newest cycle's firing point, without a verdict.
          return h('div', { class: 'big-reading', 'data-testid': 'big-alphaDeg' }, h('div', { class: 'label' }, title), h('div', { class: 'value' }, formatFixed(newestFiring, '°')), h('div', { class: 'design' }, 'newest cycle; no verdict while the control moves'));
        }
        const format = (value: number | null) => formatReading(value, reading?.unit ?? '');
        return h(
          'div',
          { class: 'big-reading', 'data-testid': `big-${keys[0]}` },
          h('div', { class: 'label' }, title),
          h('div', { class: 'value' }, reading ? format(reading.value) : '–'),
          h('div', { class: 'design' }, sessionOpen && reading?.verdict ? verdictBadge(reading.verdict) : null, ' ', !sessionOpen && reading ? 'live, no session open: not judged' : reading ? designText(reading, format) ?? (reading.verdict === null ? 'for information' : '') : 'waiting for signal'),
        );
      }),
    );
  }

  /** The capture file's reading: a bar while it reads, the outcome when it has ended. */
  private renderCaptureProgress(progress: CaptureProgress): void {
    const isCapture = this.context.store.health?.source?.kind === 'capture';
    this.captureRow.hidden = !isCapture && !this.captureOutcomeShown(progress.state, this.context.store.health);
    this.captureBar.max = Math.max(1, progress.totalBytes);
    this.captureBar.value = progress.state === 'done' ? progress.totalBytes : progress.bytesRead;
    const share = progress.totalBytes > 0 ? Math.floor((100 * (progress.state === 'done' ? progress.totalBytes : progress.bytesRead)) / progress.totalBytes) : 0;
    const words: Record<CaptureProgress['state'], string> = { reading: `${share} % of ${progress.fileName}`, done: `${progress.fileName} read to the end`, cancelled: `${progress.fileName}: stopped at ${share} %`, failed: `${progress.fileName}: ${progress.message ?? 'reading failed'}` };
    this.captureText.textContent = words[progress.state];
    this.cancelButton.hidden = progress.state !== 'reading';
  }

  /**
   * Whether the capture row stays in view once its link is gone: while it reads, and after a stop or a failure until
   * another source connects (where the reading stopped is part of what the technician must see).
   */
  private captureOutcomeShown(state: CaptureProgress['state'], link: LinkHealth | null): boolean {
    return state === 'reading' || ((state === 'cancelled' || state === 'failed') && !link?.source);
  }

  private renderLink(link: LinkHealth): void {
    if (!this.context.store.state?.session) fill(this.sessionLine, this.noSessionLine());
    const stateWords: Record<string, string> = { disconnected: 'Not connected', connecting: 'Connecting', streaming: 'Streaming', stalled: 'No data arriving', lost: 'Link lost', ended: 'Capture read to the end' };
    const progressState = this.context.store.captureProgress?.state;
    if (link.source?.kind !== 'capture' && !(progressState && this.captureOutcomeShown(progressState, link))) this.captureRow.hidden = true;
    const source = link.source ? capitalised(describeLinkSource(link.source)) : 'None';
    const cell = (label: string, value: string, testId?: string, wide = false) => h('div', { 'data-testid': testId ?? null, class: wide ? 'wide' : null }, h('span', {}, label), h('strong', {}, value));
    fill(
      this.linkPanel,
      cell('State', stateWords[link.state] ?? link.state, 'link-state'),
      cell('Source', source, 'link-source', true),
      cell('Sample rate', formatSi(link.sampleRateHz, 'S/s')),
      cell('Arriving', formatSi(link.arrivingSamplesPerS, 'S/s'), 'link-rate'),
      cell('Blocks', String(link.blocks)),
      cell('Dropped blocks', `${link.droppedBlocks} (${link.droppedSamples} samples)`, 'link-drops'),
      cell('CRC errors', String(link.crcErrors), 'link-crc'),
      cell('Bad lines', String(link.badLines)),
      cell('Last data', link.lastDataAgoMs === null ? '–' : formatSi(link.lastDataAgoMs / 1000, 's') + ' ago'),
      link.message ? h('div', { class: 'wide' }, h('span', {}, 'Message'), h('strong', {}, link.message)) : null,
    );
  }
}

function capitalised(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}
