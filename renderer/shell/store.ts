/**
 * What every screen shares: the bench state from the service, the newest live frame and the step the technician
 * is looking at. The shell subscribes to the service's events once and screens listen here.
 */
import type { BenchClient } from '../../app/contract/index';
import type { LiveFrame } from '../../app/contract/bench-events';
import type { CommissioningStep, LinkHealth, StepReport, TransferPoint } from '../../app/contract/readings';
import type { BenchState } from '../../app/contract/records';
import type { CaptureProgress } from '../../app/contract/captureImport';

/** `open-session`: a screen asks the Logbook to show one session (its id). */
export type StoreTopic = 'state' | 'live' | 'health' | 'transfer' | 'step' | 'captureProgress' | 'open-session';

export class BenchStore {
  state: BenchState | null = null;
  live: LiveFrame | null = null;
  health: LinkHealth | null = null;
  /** How far the capture file being read has come (null when the link is not a capture). */
  captureProgress: CaptureProgress | null = null;
  /** The step shown as current on the Bench screen (keyboard moves it; the service suggests it). */
  selectedStep: CommissioningStep = 'sync';
  private readonly listeners = new Map<StoreTopic, Set<(value: unknown) => void>>();

  constructor(readonly client: BenchClient) {}

  on(topic: StoreTopic, listener: (value: unknown) => void): () => void {
    let set = this.listeners.get(topic);
    if (!set) this.listeners.set(topic, (set = new Set()));
    set.add(listener);
    return () => set.delete(listener);
  }

  emit(topic: StoreTopic, value: unknown): void {
    for (const listener of this.listeners.get(topic) ?? []) listener(value);
  }

  setState(state: BenchState): void {
    const previousSession = this.state?.session?.id ?? null;
    this.state = state;
    this.health = state.link;
    if ((state.session?.id ?? null) !== previousSession) this.selectedStep = state.currentStep;
    this.emit('state', state);
  }

  async refresh(): Promise<void> {
    this.setState(await this.client.benchState());
  }

  connectEvents(): void {
    this.client.subscribe('state', (state) => this.setState(state));
    this.client.subscribe('live', (frame) => {
      this.live = frame;
      this.health = frame.link;
      this.emit('live', frame);
    });
    this.client.subscribe('health', (health) => {
      this.health = health;
      this.emit('health', health);
    });
    this.client.subscribe('transfer', (batch) => this.emit('transfer', batch.points as TransferPoint[]));
    this.client.subscribe('captureProgress', (progress) => {
      this.captureProgress = progress;
      this.emit('captureProgress', progress);
    });
  }

  /**
   * The newest live frame's step reports, or none when that frame was made before the newest state change (a step
   * recorded, a session opened or closed): frames and state travel apart and may arrive in either order, and an
   * older frame must not lay its step reports over the newer state.
   */
  liveSteps(): StepReport[] {
    const live = this.live;
    return live && this.state && live.stateSerial >= this.state.stateSerial ? live.steps : [];
  }

  selectStep(step: CommissioningStep): void {
    this.selectedStep = step;
    this.emit('step', step);
  }
}
