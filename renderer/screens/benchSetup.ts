/**
 * Starting a session: which board design, which unit, who is at the bench, and where the signals come from
 * (the logger on a serial port, or the virtual board with a fault of our own to practise on).
 */
import type { ConnectPayload } from '../../app/contract/calls';
import { h, fill, uniqueId } from '../dom/h';
import { runAction, type ScreenContext } from '../shell/screen';
import { boardFaultNames, type BoardFaultName } from '../../app/sim/faults';
import { describeLinkSource } from '../../app/contract/readings';
import { CapturePanel } from './capturePanel';

/** The virtual board's named faults (issue on the bench link), in words a technician reads. */
// Keyed by the simulator's own fault names, so a renamed or added fault fails to compile here.
const faultLabels: Record<BoardFaultName, string> = {
  'wrong-emitter-resistor': 'Wrong emitter resistor fitted',
  'capacitor-low': 'Ramp capacitor below value',
  'sync-phase-shift': 'Sync phase shifted',
  'missing-pulses': 'Missing gate pulses',
  'wrong-half-cycle-pulses': 'Pulses in the wrong half-cycle (half-wave boards)',
  'noisy-sync': 'Noisy sync',
  'clipped-ramp': 'Ramp clipping',
  'sync-offset': 'DC offset on the sync (full-wave halves fire apart)',
  'stacked-tolerances': 'Parts in tolerance that stack up (ramp short, trim needed)',
};
const virtualFaults: readonly { id: string; label: string }[] = [
  { id: '', label: 'No fault: a board built to its design' },
  ...boardFaultNames.map((id) => ({ id, label: faultLabels[id] })),
];

function field(label: string, control: HTMLElement, hint?: string, width: 'normal' | 'wide' | 'full' = 'normal'): HTMLElement {
  const id = uniqueId('setup');
  control.id = id;
  // Choices with long names (a design and its version, a port with its maker) get two columns, so they show whole.
  return h('label', { class: width === 'normal' ? 'field' : `field ${width}`, for: id }, label, control, hint ? h('span', { class: 'muted' }, hint) : null);
}

export class BenchSetup {
  readonly element: HTMLElement;
  private readonly designSelect = h('select', { name: 'design', 'data-testid': 'setup-design' });
  private readonly serialInput = h('input', { name: 'unit', type: 'text', autocomplete: 'off', placeholder: 'e.g. FB-2026-0142', 'data-testid': 'setup-unit' });
  private readonly operatorInput = h('input', { name: 'operator', type: 'text', autocomplete: 'name', placeholder: 'Your name', 'data-testid': 'setup-operator' });
  private readonly sourceSelect = h('select', { name: 'source', 'data-testid': 'setup-source' });
  private readonly faultSelect = h('select', { name: 'fault', 'data-testid': 'setup-fault' }, virtualFaults.map((fault) => h('option', { value: fault.id }, fault.label)));
  private readonly faultField: HTMLElement;
  private readonly startButton = h('button', { class: 'primary', type: 'submit', 'data-testid': 'start-session' }, 'Connect and start session');
  private readonly problem = h('p', { class: 'field-problem', role: 'alert' });
  private readonly capture: CapturePanel;

  constructor(private readonly context: ScreenContext) {
    this.faultField = field('Virtual board fault', this.faultSelect, 'The virtual board follows the design, then adds this fault.');
    this.capture = new CapturePanel(context, () => this.designSelect.value);
    this.capture.element.hidden = true;
    this.sourceSelect.addEventListener('change', () => this.updateSource());
    const form = h(
      'form',
      { class: 'stack', 'aria-label': 'Start a session', onsubmit: (event: Event) => { event.preventDefault(); void this.start(); } },
      h('div', { class: 'form-grid wide-fields setup-fields' }, field('Board design', this.designSelect, undefined, 'wide'), field('Unit serial number', this.serialInput), field('Operator', this.operatorInput), field('Signals from', this.sourceSelect, undefined, 'full')),
      this.faultField,
      this.capture.element,
      this.problem,
      h('div', { class: 'row' }, this.startButton, h('button', { class: 'secondary', type: 'button', onclick: () => context.go('board') }, 'Edit board designs')),
    );
    this.element = h('section', { class: 'panel stack', 'aria-labelledby': 'setup-title' }, h('h2', { id: 'setup-title' }, 'Start a session'), h('p', { class: 'muted' }, 'Pick the board design, type the unit’s serial number and connect. Readings go into the logbook as they come.'), form);
  }

  async load(): Promise<void> {
    const [designs, ports] = await Promise.all([this.context.client.listDesigns(), this.context.client.listPorts().catch(() => ({ ports: [] }))]);
    const previous = this.designSelect.value;
    fill(this.designSelect, designs.designs.length === 0 ? h('option', { value: '' }, 'No designs yet: add one on the Board screen') : designs.designs.map((design) => h('option', { value: design.name }, `${design.name} (v${design.version}, ${design.mainsHz} Hz ${design.rectifier})`)));
    if (previous) this.designSelect.value = previous;
    const previousSource = this.sourceSelect.value;
    const link = this.context.store.health;
    const linkUp = link !== null && link.source !== null && (link.state === 'streaming' || link.state === 'connecting' || link.state === 'stalled');
    const current = linkUp && link.source ? describeLinkSource(link.source) : '';
    // A port on a USB-serial bridge loggers are built on is offered first (before the virtual board): it is most
    // likely the logger plugged in for this session.
    const portOption = (port: (typeof ports.ports)[number]): HTMLElement =>
      h('option', { value: `serial:${port.path}` }, `Logger on ${port.path}${port.loggerBridge ? ` (${port.loggerBridge})` : port.manufacturer ? ` (${port.manufacturer})` : ''}`);
    fill(
      this.sourceSelect,
      linkUp ? h('option', { value: 'keep' }, `The link as it is (${current})`) : null,
      ports.ports.filter((port) => port.loggerBridge).map(portOption),
      h('option', { value: 'virtual' }, 'Virtual board (no hardware)'),
      ports.ports.filter((port) => !port.loggerBridge).map(portOption),
      h('option', { value: 'capture' }, 'A capture file (CSV or COMTRADE)'),
    );
    if (previousSource && [...this.sourceSelect.options].some((option) => option.value === previousSource)) this.sourceSelect.value = previousSource;
    this.updateSource();
  }

  /** After a unit is signed off: the serial field is emptied, so the next session cannot be logged under it by mistake. */
  clearUnit(): void {
    this.serialInput.value = '';
  }

  private updateSource(): void {
    this.faultField.hidden = this.sourceSelect.value !== 'virtual';
    this.capture.element.hidden = this.sourceSelect.value !== 'capture';
  }

  private async start(): Promise<void> {
    const designName = this.designSelect.value;
    const unitSerial = this.serialInput.value.trim();
    const operator = this.operatorInput.value.trim();
    const missing = [!designName && 'a board design', !unitSerial && 'the unit serial number', !operator && 'the operator'].filter(Boolean);
    if (missing.length > 0) {
      this.problem.textContent = `Please give ${missing.join(', ')}.`;
      return;
    }
    this.problem.textContent = '';
    const source = this.sourceSelect.value;
    if (source === 'capture' && !this.capture.ready) {
      this.problem.textContent = 'Choose the capture file and say which channel is which, until the reading shows no problem.';
      return;
    }
    const payload: ConnectPayload | null =
      source === 'keep'
        ? null
        : source === 'capture'
          ? { kind: 'capture', uploadId: this.capture.uploadId as string, designName, fields: this.capture.fields(), speed: this.capture.speed }
          : source.startsWith('serial:')
            ? { kind: 'serial', path: source.slice('serial:'.length) }
            : { kind: 'virtual', designName, faults: this.faultSelect.value ? [this.faultSelect.value] : [] };
    await runAction(this.context, this.startButton, async () => {
      if (source === 'capture' && this.capture.rememberRoles) {
        const channelMap = this.capture.fields().channelMap;
        if (channelMap) {
          const saved = await this.context.client.saveCaptureMap({ designName, channelMap });
          this.context.notices.show('info', `Roles remembered for ${saved.summary.name} (version ${saved.summary.version}).`);
        }
      }
      if (payload) {
        const link = this.context.store.health;
        if (link && link.state !== 'disconnected') await this.context.client.disconnect();
        await this.context.client.connect(payload);
      }
      await this.context.client.startSession({ unitSerial, designName, operator });
      await this.context.store.refresh();
    });
  }
}
