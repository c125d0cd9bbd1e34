/**
 * Opening a capture file instead of a live link (Bench screen, "Signals from: a capture file"): choose or drop the
 * file, see the channels it holds with a first look at each, say which is sync, ramp, gate and control (with a probe's
 * scale and an inversion), and check how it will be read. The file travels to the bench in pieces over the contract.
 */
import { formatChannelMap, type ChannelMap } from '../../app/capture/channelMap';
import type { CaptureChannel, CaptureField, CapturePreviewResult, CaptureReadFields } from '../../app/contract/captureImport';
import { h, fill, uniqueId } from '../dom/h';
import type { ScreenContext } from '../shell/screen';

type Role = 'sync' | 'ramp' | 'gate' | 'control';
const roles: readonly Role[] = ['sync', 'ramp', 'gate', 'control'];
const roleWords: Record<Role, string> = { sync: 'Sync', ramp: 'Ramp', gate: 'Gate', control: 'Control (optional)' };

function field(label: string, control: HTMLElement, hint?: string): HTMLElement {
  const id = uniqueId('capture');
  control.id = id;
  return h('label', { class: 'field', for: id }, label, control, hint ? h('span', { class: 'muted small' }, hint) : null);
}

/** base64 of bytes, in slices (String.fromCharCode takes a limited number of arguments). */
function base64Of(bytes: Uint8Array): string {
  let binary = '';
  for (let start = 0; start < bytes.length; start += 0x8000) binary += String.fromCharCode(...bytes.subarray(start, start + 0x8000));
  return btoa(binary);
}

/** A small trace of a channel's first samples: min-max pairs as a polyline in a 120 x 28 box. */
function traceOf(channel: CaptureChannel): SVGSVGElement {
  const svgNs = 'http://www.w3.org/2000/svg';
  const svg = document.createElementNS(svgNs, 'svg');
  svg.setAttribute('viewBox', '0 0 120 28');
  svg.setAttribute('class', 'trace');
  svg.setAttribute('aria-hidden', 'true');
  const { minV, maxV, trace } = channel;
  if (minV === null || maxV === null || trace.length < 2) return svg;
  const span = maxV - minV || 1;
  const points: string[] = [];
  const pairs = trace.length / 2;
  for (let index = 0; index < trace.length; index++) {
    const x = (Math.floor(index / 2) / Math.max(1, pairs - 1)) * 118 + 1;
    const y = 27 - ((trace[index] - minV) / span) * 26;
    points.push(`${x.toFixed(1)},${y.toFixed(1)}`);
  }
  const line = document.createElementNS(svgNs, 'polyline');
  line.setAttribute('points', points.join(' '));
  svg.append(line);
  return svg;
}

function volts(value: number | null): string {
  if (value === null) return '–';
  return Math.abs(value) >= 100 ? value.toFixed(0) : Math.abs(value) >= 1 ? value.toFixed(2) : value.toFixed(3);
}

export class CapturePanel {
  readonly element: HTMLElement;
  private readonly fileInput = h('input', { type: 'file', multiple: true, accept: '.csv,.cfg,.dat,.cff', 'data-testid': 'capture-file' });
  private readonly dropZone: HTMLElement;
  private readonly uploadProgress = h('progress', { max: 1, value: 0, hidden: true, 'data-testid': 'capture-upload-progress' });
  private readonly status = h('p', { class: 'muted', 'data-testid': 'capture-status' }, 'No capture chosen yet.');
  private readonly channelsArea = h('div', { 'data-testid': 'capture-channels' });
  private readonly rolesArea = h('div', { class: 'form-grid', 'data-testid': 'capture-roles' });
  private readonly readAs = h('p', { class: 'muted', 'data-testid': 'capture-read-as' });
  private readonly problem = h('p', { class: 'field-problem', role: 'alert', 'data-testid': 'capture-problem' });
  private readonly separator = h('select', { 'data-field': 'separator' }, h('option', { value: '' }, 'As found'), h('option', { value: 'comma' }, 'Comma'), h('option', { value: 'semicolon' }, 'Semicolon'), h('option', { value: 'tab' }, 'Tab'));
  private readonly decimal = h('select', { 'data-field': 'decimal' }, h('option', { value: '' }, 'As found'), h('option', { value: 'point' }, 'Point (1.5)'), h('option', { value: 'comma' }, 'Comma (1,5)'));
  private readonly timeUnit = h('select', { 'data-field': 'timeUnit' }, h('option', { value: '' }, 'As found'), h('option', { value: 's' }, 's'), h('option', { value: 'ms' }, 'ms'), h('option', { value: 'us' }, 'µs'));
  private readonly headerLine = h('input', { type: 'number', min: 0, step: 1, placeholder: 'as found', 'data-field': 'headerLine' });
  private readonly sampleRate = h('input', { type: 'number', min: 1000, max: 1000000, step: 1, placeholder: 'from the file', 'data-field': 'sampleRateHz' });
  private readonly timeColumn = h('select', { 'data-field': 'time', 'data-testid': 'capture-time' });
  private readonly remember = h('input', { type: 'checkbox', 'data-testid': 'capture-remember' });
  private readonly pace = h('select', { 'data-testid': 'capture-pace' }, h('option', { value: '1' }, 'As recorded (real time)'), h('option', { value: '0' }, 'As fast as it reads'));
  private readonly checkButton = h('button', { class: 'secondary', type: 'button', 'data-testid': 'capture-check' }, 'Check the reading');
  private readonly roleSelects = new Map<Role, { channel: HTMLSelectElement; scale: HTMLInputElement; invert: HTMLInputElement }>();
  private preview: CapturePreviewResult | null = null;
  private busy = false;

  constructor(
    private readonly context: ScreenContext,
    private readonly designName: () => string,
  ) {
    this.dropZone = h(
      'div',
      { class: 'drop-zone', 'data-testid': 'capture-drop', tabindex: 0 },
      h('strong', {}, 'Drop a capture file here'),
      h('span', { class: 'muted' }, 'CSV (ours, or an instrument’s or spreadsheet’s), COMTRADE .cfg with its .dat, or a .cff'),
      h('label', { class: 'secondary-file' }, 'or choose… ', this.fileInput),
    );
    this.dropZone.addEventListener('dragover', (event) => {
      event.preventDefault();
      this.dropZone.classList.add('dragging');
    });
    this.dropZone.addEventListener('dragleave', () => this.dropZone.classList.remove('dragging'));
    this.dropZone.addEventListener('drop', (event) => {
      event.preventDefault();
      this.dropZone.classList.remove('dragging');
      const files = [...(event.dataTransfer?.files ?? [])];
      // The picker's own name would be the older file's now.
      this.fileInput.value = '';
      if (files.length > 0) void this.send(files);
    });
    this.fileInput.addEventListener('change', () => {
      const files = [...(this.fileInput.files ?? [])];
      if (files.length > 0) void this.send(files);
    });
    this.checkButton.addEventListener('click', () => void this.inspect(this.roleMap()));
    for (const input of [this.separator, this.decimal, this.timeUnit, this.headerLine, this.sampleRate]) input.addEventListener('change', () => void this.inspect(this.roleMap()));
    const dialect = h(
      'details',
      { 'data-testid': 'capture-dialect' },
      h('summary', {}, 'If the file is read wrongly'),
      h('div', { class: 'form-grid' }, field('Separator', this.separator), field('Decimal mark', this.decimal), field('Time unit', this.timeUnit), field('Line of the column names', this.headerLine, '0: the file has none'), field('Sample rate (Hz)', this.sampleRate, 'for a file without times')),
    );
    this.element = h(
      'fieldset',
      { class: 'capture-panel stack', 'data-testid': 'capture-panel' },
      h('legend', {}, 'Capture file'),
      this.dropZone,
      this.uploadProgress,
      this.status,
      this.channelsArea,
      this.rolesArea,
      dialect,
      this.readAs,
      this.problem,
      h('div', { class: 'row' }, this.checkButton, field('Play', this.pace), h('label', { class: 'row' }, this.remember, h('span', {}, 'Remember these roles for the design'))),
    );
    this.checkButton.disabled = true;
  }

  /** Ready to open: a file sent and read without a problem. */
  get ready(): boolean {
    return this.preview !== null && this.preview.problem === null && !this.busy;
  }

  get uploadId(): string | null {
    return this.preview?.uploadId ?? null;
  }

  get speed(): number {
    return Number(this.pace.value);
  }

  get rememberRoles(): boolean {
    return this.remember.checked;
  }

  /** The form as the contract's fields: the roles in the command line's words, and what the CSV cannot tell. */
  fields(): CaptureReadFields {
    const fields: CaptureReadFields = {};
    const map = this.roleMap();
    if (map) fields.channelMap = map;
    if (this.separator.value) fields.separator = this.separator.value as CaptureReadFields['separator'];
    if (this.decimal.value) fields.decimal = this.decimal.value as CaptureReadFields['decimal'];
    if (this.timeUnit.value) fields.timeUnit = this.timeUnit.value as CaptureReadFields['timeUnit'];
    if (this.headerLine.value !== '') fields.headerLine = Number(this.headerLine.value);
    if (this.sampleRate.value !== '') fields.sampleRateHz = Number(this.sampleRate.value);
    return fields;
  }

  private async send(files: File[]): Promise<void> {
    this.busy = true;
    this.preview = null;
    this.problem.textContent = '';
    fill(this.channelsArea);
    fill(this.rolesArea);
    this.readAs.textContent = '';
    const names = files.map((file) => file.name).join(' + ');
    this.status.textContent = `Sending ${names}…`;
    this.uploadProgress.hidden = false;
    try {
      const client = this.context.client;
      const { uploadId, pieceBytes } = await client.captureUploadStart({ files: files.map((file) => ({ name: file.name, sizeBytes: file.size })) });
      const total = files.reduce((sum, file) => sum + file.size, 0);
      let sent = 0;
      for (const [fileIndex, file] of files.entries()) {
        for (let offset = 0; offset < file.size; offset += pieceBytes) {
          const bytes = new Uint8Array(await file.slice(offset, offset + pieceBytes).arrayBuffer());
          await client.captureUploadChunk({ uploadId, fileIndex, offset, contentBase64: base64Of(bytes) });
          sent += bytes.length;
          this.uploadProgress.max = total;
          this.uploadProgress.value = sent;
        }
      }
      this.status.textContent = `${names}: ${(total / (1 << 20)).toFixed(1)} MiB sent.`;
      this.busy = false;
      await this.inspect(undefined, uploadId);
    } catch (error) {
      this.status.textContent = `${names} could not be sent.`;
      this.context.notices.fromError(error);
    } finally {
      this.busy = false;
      this.uploadProgress.hidden = true;
    }
  }

  private async inspect(channelMap: string | undefined, uploadId = this.uploadId): Promise<void> {
    if (uploadId === null) return;
    const fields = { ...this.fields(), channelMap };
    if (channelMap === undefined) delete fields.channelMap;
    try {
      const preview = await this.context.client.inspectCapture({ uploadId, designName: this.designName() || undefined, fields });
      this.show(preview);
    } catch (error) {
      this.context.notices.fromError(error);
    }
  }

  private show(preview: CapturePreviewResult): void {
    this.preview = preview;
    this.checkButton.disabled = false;
    fill(
      this.channelsArea,
      preview.channels.length === 0
        ? null
        : h(
            'table',
            { class: 'data capture-channels' },
            h('caption', { class: 'muted' }, `${preview.format === 'csv' ? 'Columns' : 'Channels'} found, with the first ${preview.samples} samples of each`),
            h('thead', {}, h('tr', {}, h('th', {}, 'Channel'), h('th', {}, 'Unit'), h('th', {}, 'From'), h('th', {}, 'To'), h('th', {}, 'First look'))),
            h(
              'tbody',
              {},
              preview.channels.map((channel) =>
                h('tr', { 'data-channel': channel.reference }, h('td', {}, channel.label), h('td', {}, channel.unit || (channel.kind === 'digital' ? '0/1' : '–')), h('td', { class: 'number' }, volts(channel.minV)), h('td', { class: 'number' }, volts(channel.maxV)), h('td', {}, traceOf(channel))),
              ),
            ),
          ),
    );
    this.showRoles(preview);
    this.readAs.textContent = preview.readAs ? `Read as: ${preview.readAs}` : '';
    this.problem.textContent = preview.problem ? preview.problem.message : '';
    this.markField(preview.problem?.field ?? null);
    this.status.textContent = preview.problem ? `${preview.fileNames.join(' + ')}: say which channel is which, then check the reading.` : `${preview.fileNames.join(' + ')}: ready to open${preview.mapSource === 'design' ? ' (roles remembered for this design)' : ''}.`;
  }

  private showRoles(preview: CapturePreviewResult): void {
    // The roles the bench would read it with now (given, the design's, or by the channels' own names), as the start.
    const current = preview.roles;
    this.roleSelects.clear();
    const controls = roles.map((role) => {
      const choice = current?.[role] ?? null;
      const select = h('select', { 'data-role': role, 'data-testid': `capture-role-${role}` }, h('option', { value: '' }, role === 'control' ? 'none' : 'choose…'), preview.channels.map((channel) => h('option', { value: channel.reference }, channel.label)));
      select.value = choice?.reference ?? '';
      const scale = h('input', { type: 'number', min: 0.001, step: 'any', value: choice?.scale ?? 1, 'aria-label': `${role} scale`, class: 'scale' });
      const invert = h('input', { type: 'checkbox', checked: choice?.invert ?? false, 'aria-label': `${role} inverted` });
      this.roleSelects.set(role, { channel: select, scale, invert });
      return h('div', { class: `role-choice ${role}` }, field(roleWords[role], select), h('div', { class: 'row small' }, h('label', { class: 'row' }, 'x', scale), h('label', { class: 'row' }, invert, 'inverted')));
    });
    if (preview.format === 'csv') {
      fill(this.timeColumn, h('option', { value: '' }, 'As found'), h('option', { value: 'none' }, 'None (sample rate)'), preview.channels.map((channel) => h('option', { value: channel.reference }, channel.label)));
      controls.push(h('div', { class: 'role-choice' }, field('Time', this.timeColumn)));
    }
    fill(this.rolesArea, controls);
  }

  /** The roles as chosen, in the channel map's words (a name when it is the only one, else a number). */
  private roleMap(): string | undefined {
    const preview = this.preview;
    if (preview === null || this.roleSelects.size === 0) return undefined;
    const map: ChannelMap = {};
    const referenceOf = (reference: string): string | number => {
      const channel = preview.channels.find((candidate) => candidate.reference === reference);
      const name = channel?.name.trim() ?? '';
      const unique = name !== '' && preview.channels.filter((candidate) => candidate.name.trim().toLowerCase() === name.toLowerCase()).length === 1;
      if (unique) return name;
      return /^\d+$/.test(reference) ? Number(reference) : reference;
    };
    for (const [role, controls] of this.roleSelects) {
      if (controls.channel.value === '') continue;
      const scale = Number(controls.scale.value);
      map[role] = { channel: referenceOf(controls.channel.value), scale: scale > 0 ? scale : 1, invert: controls.invert.checked };
    }
    if (preview.format === 'csv' && this.timeColumn.value !== '') map.time = this.timeColumn.value === 'none' ? null : referenceOf(this.timeColumn.value);
    const text = formatChannelMap(map);
    return text === '' ? undefined : text;
  }

  private markField(field: CaptureField | null): void {
    for (const element of this.element.querySelectorAll('[data-field], [data-role]')) element.removeAttribute('aria-invalid');
    if (field === null) return;
    const selector = field === 'channelMap' ? '[data-role]' : `[data-field="${field}"]`;
    for (const element of this.element.querySelectorAll(selector)) element.setAttribute('aria-invalid', 'true');
    if (field !== 'channelMap') (this.element.querySelector('details') as HTMLDetailsElement).open = true;
  }
}
