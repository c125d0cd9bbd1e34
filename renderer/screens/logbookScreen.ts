/**
 * Logbook: units and sessions with filters; one session's readings, transfer curve, per-cycle plot, trims and link
 * events; two sessions side by side; a unit's drift across its sessions, and its board design's fleet. Each session
 * names the bench that did it (a shared logbook holds a whole line's); a bench that pushes to a shared logbook shows
 * which of its sessions are not yet shared. Times are shown in local time; the logbook keeps UTC.
 */
import type { BoardDesign } from '../../app/board/design';
import { recordedPartName, recordedPartValue } from '../../app/board/partNames';
import type { CallResult } from '../../app/contract';
import { signOffExceptionText } from '../../app/bench/signOffGate';
import { type SessionComparison, type SessionDetail, type SessionRow } from '../../app/contract/records';
import { createXyChart, cssColour, lineDataset, pointsDataset, restyleChart, type Chart } from '../charts/chartSetup';
import { base64ToBytes, downloadBytes } from '../dom/download';
import { h, fill, uniqueId } from '../dom/h';
import { verdictBadge } from '../dom/verdictBadge';
import { formatFixed, formatReading, formatSi } from '../shaping/formatSi';
import { stepReadingsCsv } from '../../app/exchange/recordCsv';
import { stepTitles, wordedValue } from '../shaping/stepView';
import { localSpanText } from '../shaping/timeSpan';
import { fitLinePoints, toPoints, transferRangeV } from '../shaping/transferView';
import { runAction, type Screen, type ScreenContext } from '../shell/screen';
import { outcomeBadge } from '../dom/outcomeBadge';
import { DriftPanel } from './driftPanel';
import { FleetPanel } from './fleetPanel';
import { localTimeNote, sharedCell, sharingMoved, sharingPollMs, sharingStatus } from './sharingView';

type LineChart = Chart<'line', { x: number; y: number }[]>;

export class LogbookScreen implements Screen {
  readonly name = 'logbook' as const;
  readonly title = 'Logbook';
  readonly element: HTMLElement;
  private readonly unitSelect = h('select', { 'data-testid': 'filter-unit' });
  private readonly designSelect = h('select', { 'data-testid': 'filter-design' });
  private readonly fromInput = h('input', { type: 'date', 'data-testid': 'filter-from' });
  private readonly toInput = h('input', { type: 'date', 'data-testid': 'filter-to' });
  private readonly unitsList = h('ul', { class: 'stack plain-list', 'data-testid': 'units-list' });
  private readonly sessionsTable = h('div', { class: 'table-scroll', 'data-testid': 'sessions' });
  private readonly sharingLine = h('div', { class: 'sharing', 'data-testid': 'sharing', hidden: true });
  private sharing: CallResult<'sharing'> | null = null;
  private readonly compareButton = h('button', { class: 'primary', type: 'button', disabled: true, 'data-testid': 'compare' }, 'Compare the two ticked sessions');
  private readonly detail = h('section', { class: 'panel stack', hidden: true, 'aria-label': 'Session', 'data-testid': 'session-detail' });
  private readonly comparison = h('section', { class: 'panel stack', hidden: true, 'aria-label': 'Two sessions side by side', 'data-testid': 'comparison' });
  private readonly drift: DriftPanel;
  private readonly fleet: FleetPanel;
  private readonly charts: LineChart[] = [];
  private unitDesigns = new Map<string, string>();
  private sessions: SessionRow[] = [];
  /** Older sessions match the filters too (only the newest are listed). */
  private olderMatch = false;
  private ticked: number[] = [];
  private selectedId: number | null = null;

  constructor(private readonly context: ScreenContext) {
    this.fleet = new FleetPanel(context);
    this.drift = new DriftPanel(context);
    context.store.on('open-session', (sessionId) => void this.showDetail(sessionId as number).then(() => this.detail.scrollIntoView({ block: 'start' })));
    for (const control of [this.unitSelect, this.designSelect, this.fromInput, this.toInput]) control.addEventListener('change', () => void this.loadSessions());
    this.compareButton.addEventListener('click', () => void this.compare());
    // A bench pushing as it goes: the sharing line and the Shared column follow without the screen being reopened.
    window.setInterval(() => void this.followSharing(), sharingPollMs);
    const field = (label: string, control: HTMLElement) => {
      const id = uniqueId('filter');
      control.id = id;
      return h('label', { class: 'field', for: id }, label, control);
    };
    this.element = h(
      'div',
      {},
      h('h1', { class: 'screen-title' }, 'Logbook'),
      h(
        'div',
        { class: 'logbook' },
        h(
          'div',
          { class: 'stack' },
          h('section', { class: 'panel stack', 'aria-labelledby': 'filters-title' }, h('h2', { id: 'filters-title' }, 'Filters'), field('Unit', this.unitSelect), field('Board design', this.designSelect), field('From', this.fromInput), field('To', this.toInput)),
          h('section', { class: 'panel stack', 'aria-labelledby': 'units-title' }, h('h2', { id: 'units-title' }, 'Units'), this.unitsList),
        ),
        h('div', { class: 'stack' }, h('section', { class: 'panel stack', 'aria-labelledby': 'sessions-title' }, h('h2', { id: 'sessions-title' }, 'Sessions'), this.sharingLine, this.sessionsTable, h('div', { class: 'row' }, this.compareButton, h('span', { class: 'muted' }, 'Tick two sessions to compare them.')), h('p', { class: 'muted', 'data-testid': 'time-note' }, localTimeNote())), this.detail, this.comparison, this.drift.element, this.fleet.element),
      ),
    );
  }

  shown(): void {
    void this.loadFilters().then(() => this.loadSessions());
  }

  restyle(): void {
    for (const chart of this.charts) restyleChart(chart);
    this.drift.restyle();
    this.fleet.restyle();
  }

  private async loadFilters(): Promise<void> {
    const result = await runAction(this.context, null, () => Promise.all([this.context.client.listUnits({}), this.context.client.listDesigns()]));
    if (!result) return;
    const [units, designs] = result;
    this.unitDesigns = new Map(units.units.filter((unit) => unit.designName).map((unit) => [unit.serial, unit.designName as string]));
    const unitValue = this.unitSelect.value;
    const designValue = this.designSelect.value;
    fill(this.unitSelect, h('option', { value: '' }, 'All units'), units.units.map((unit) => h('option', { value: unit.serial }, unit.serial)));
    fill(this.designSelect, h('option', { value: '' }, 'All designs'), designs.designs.map((design) => h('option', { value: design.name }, design.name)));
    this.unitSelect.value = unitValue;
    this.designSelect.value = designValue;
    fill(
      this.unitsList,
      units.units.length === 0 ? h('li', { class: 'empty' }, 'No units yet: commission one on the Bench screen.') : null,
      units.units.map((unit) => {
        const pick = h('button', { class: 'secondary', type: 'button', 'data-unit': unit.serial }, unit.serial);
        pick.addEventListener('click', () => {
          this.unitSelect.value = unit.serial;
          void this.loadSessions();
        });
        return h('li', {}, pick, h('div', { class: 'muted' }, `${unit.designName ?? 'no design'} · ${unit.sessions} session${unit.sessions === 1 ? '' : 's'}${unit.lastSessionAt ? ` · last ${new Date(unit.lastSessionAt).toLocaleDateString()}` : ''}`));
      }),
    );
  }

  /** The sessions matching the filters and the sharing state, read again and shown; false when the list failed. */
  private async readSessions(): Promise<boolean> {
    const dayStart = (value: string, end: boolean) => (value ? `${value}T${end ? '23:59:59' : '00:00:00'}Z` : undefined);
    const result = await runAction(this.context, null, () =>
      this.context.client.listSessions({ unitSerial: this.unitSelect.value || undefined, designName: this.designSelect.value || undefined, from: dayStart(this.fromInput.value, false), to: dayStart(this.toInput.value, true) }),
    );
    if (!result) return false;
    this.sessions = result.sessions;
    this.olderMatch = result.more;
    this.sharing = await this.context.client.sharing().catch(() => null);
    this.renderSharing();
    this.ticked = this.ticked.filter((id) => this.sessions.some((session) => session.id === id));
    this.renderSessions();
    return true;
  }

  private async followSharing(): Promise<void> {
    if (this.element.hidden || document.hidden || this.sharing?.target == null) return;
    const now = await this.context.client.sharing().catch(() => null);
    if (!now) return;
    if (sharingMoved(this.sharing, now)) {
      await this.readSessions();
      return;
    }
    this.sharing = now;
    this.renderSharing();
  }

  private async loadSessions(): Promise<void> {
    if (!(await this.readSessions())) return;
    const unitSerial = this.unitSelect.value;
    if (unitSerial) {
      void this.drift.show(unitSerial, (sessionId) => this.sessions.find((session) => session.id === sessionId)?.bench ?? null);
      const designName = this.unitDesigns.get(unitSerial);
      if (designName) void this.fleet.show(designName, unitSerial);
    } else {
      this.drift.hide();
      this.fleet.hide();
    }
  }

  private renderSharing(): void {
    const parts = sharingStatus(this.sharing);
    this.sharingLine.hidden = parts === null;
    if (parts) fill(this.sharingLine, parts);
  }

  private renderSessions(): void {
    this.compareButton.disabled = this.ticked.length !== 2;
    if (this.sessions.length === 0) {
      fill(this.sessionsTable, h('p', { class: 'empty' }, 'No sessions match these filters.'));
      return;
    }
    const pushing = this.sharing?.target != null;
    fill(
      this.sessionsTable,
      h(
        'table',
        { class: 'data' },
        h('thead', {}, h('tr', {}, ['Compare', 'Session', 'Unit', 'Bench', 'Design', 'Operator', 'Outcome', 'Started', ...(pushing ? ['Shared'] : []), 'Ramp peak (as recorded)', 'α range (as recorded)', 'Cycles', 'Link errors'].map((title) => h('th', { scope: 'col' }, title)))),
        h(
          'tbody',
          {},
          this.sessions.map((session) => {
            const tick = h('input', { type: 'checkbox', 'aria-label': `Compare session ${session.id}`, checked: this.ticked.includes(session.id), 'data-testid': `tick-${session.id}` });
            tick.addEventListener('click', (event) => event.stopPropagation());
            tick.addEventListener('change', () => {
              this.ticked = tick.checked ? [...this.ticked.filter((id) => id !== session.id), session.id].slice(-2) : this.ticked.filter((id) => id !== session.id);
              this.renderSessions();
            });
            const open = h('button', { class: 'secondary', type: 'button', 'data-testid': `open-session-${session.id}` }, `#${session.id}`);
            open.addEventListener('click', () => void this.showDetail(session.id));
            return h(
              'tr',
              { 'aria-selected': String(session.id === this.selectedId), 'data-session': session.id },
              h('td', {}, tick),
              h('td', {}, open),
              h('td', { class: 'nowrap' }, session.unit),
              h('td', { class: 'nowrap', 'data-testid': `bench-${session.id}` }, session.bench ?? '–'),
              h('td', {}, `${session.designName} v${session.designVersion}`),
              h('td', {}, session.operator),
              h('td', { 'data-outcome': session.outcome }, outcomeBadge(session.outcome)),
              h('td', {}, new Date(session.startedAt).toLocaleString()),
              pushing ? h('td', { class: 'nowrap', 'data-testid': `shared-${session.id}` }, sharedCell(session)) : null,
              h('td', { class: 'number', 'data-column': 'ramp-peak' }, formatSi(session.rampPeakV, 'V')),
              h('td', { class: 'number' }, session.alphaMinDeg === null && session.alphaMaxDeg === null ? '–' : `${formatFixed(session.alphaMinDeg, '°')} to ${formatFixed(session.alphaMaxDeg, '°')}`),
              h('td', { class: 'number' }, session.cycles),
              h('td', { class: 'number' }, session.linkSilentS > 0 ? `${session.linkErrors}, silent ${session.linkSilentS.toFixed(1)} s` : session.linkErrors),
            );
          }),
        ),
      ),
      this.olderMatch ? h('p', { class: 'muted', 'data-testid': 'older-sessions' }, `The newest ${this.sessions.length} sessions are shown; older ones match too: choose a unit, a board design or dates to see them.`) : null,
    );
  }

  private async showDetail(sessionId: number): Promise<void> {
    const detail = await runAction(this.context, null, () => this.context.client.sessionDetail({ sessionId }));
    if (!detail) return;
    this.selectedId = sessionId;
    this.renderSessions();
    this.renderDetail(detail);
  }

  private renderDetail(detail: SessionDetail): void {
    const row = detail.row;
    const transferCanvas = h('canvas', { role: 'img', 'aria-label': `Transfer curve of session ${row.id}: ${detail.transfer.points.length} points`, 'data-testid': 'detail-transfer-canvas', 'data-points': String(detail.transfer.points.length) });
    const peaks = detail.perCycle.filter((cycle) => cycle.rampPeakV !== null).map((cycle) => ({ x: cycle.t, y: cycle.rampPeakV as number }));
    const alphas = detail.perCycle.filter((cycle) => cycle.alphaDeg !== null).map((cycle) => ({ x: cycle.t, y: cycle.alphaDeg as number }));
    // Ramp peak when the session kept it per cycle, otherwise the firing angle.
    const perCycleTitle = peaks.length > 0 ? 'Ramp peak per cycle, whole session' : 'Firing angle per cycle, whole session';
    const cycleCanvas = h('canvas', { role: 'img', 'aria-label': `${perCycleTitle} over session ${row.id}`, 'data-testid': 'detail-cycles-canvas', 'data-points': String(peaks.length > 0 ? peaks.length : alphas.length) });
    const exportArea = h('div', { class: 'row' });
    const csv = h('button', { class: 'secondary', type: 'button', 'data-testid': 'export-readings' }, 'Export readings (CSV)');
    csv.addEventListener('click', () => downloadBytes(`${row.unit}-session-${row.id}-readings.csv`, 'text/csv', stepReadingsCsv(detail.steps)));
    exportArea.appendChild(csv);
    void this.context.client.exportFormats().then(
      (result) => {
        for (const format of result.formats) {
          const button = h('button', { class: 'secondary', type: 'button' }, `Export ${format.label}`);
          button.addEventListener('click', () => void runAction(this.context, button, async () => {
            const file = await this.context.client.exportSession({ sessionId: row.id, format: format.id });
            downloadBytes(file.fileName, file.mediaType, base64ToBytes(file.contentBase64));
          }));
          exportArea.appendChild(button);
        }
      },
      () => undefined, // no registered formats: the CSV button stays
    );
    // Parts in words, with the designators once the session's design version is at hand.
    const measuredList = h('ul', { 'data-testid': 'detail-measured' });
    const trimList = h('ul', { 'data-testid': 'detail-trims' });
    const fillParts = (design: BoardDesign | null): void => {
      fill(measuredList, detail.partMeasurements.map((measured) => h('li', {}, `${capitalised(recordedPartName(design, measured.part))}: ${recordedPartValue(measured.part, measured.value)} measured, design ${recordedPartValue(measured.part, measured.designValue)}, ${new Date(measured.at).toLocaleTimeString()}`)));
      // What changed and when first; the plan's reason (its own sentence) after it.
      fill(trimList, detail.trims.map((trim) => h('li', {}, `${capitalised(recordedPartName(design, trim.part))}: ${trim.part === 'transistor' ? 'replaced' : `${recordedPartValue(trim.part, trim.fromOhm)} → ${recordedPartValue(trim.part, trim.toOhm)}`} at ${new Date(trim.at).toLocaleTimeString()}. ${trim.reason || 'No reason given.'}`)));
    };
    fillParts(null);
    if (detail.partMeasurements.length + detail.trims.length > 0) {
      void this.context.client.getDesign({ name: row.designName, version: row.designVersion }).then((stored) => fillParts(stored.design), () => undefined);
    }
    const readingRows = detail.steps.flatMap((step) =>
      step.readings.map((reading) =>
        h('tr', {}, h('td', {}, stepTitles[step.step]), h('td', {}, reading.label), h('td', { class: 'number', 'data-reading': reading.key }, wordedValue(reading) ?? formatReading(reading.value, reading.unit)), h('td', { class: 'number' }, formatReading(reading.expected, reading.unit)), h('td', {}, reading.verdict ? verdictBadge(reading.verdict) : h('span', { class: 'muted' }, 'for information'))),
      ),
    );
    fill(
      this.detail,
      h('h2', {}, `Session ${row.id}: unit ${row.unit}`),
      h('p', { class: 'muted' }, `${row.designName} v${row.designVersion} · ${row.bench ? `${row.bench} · ` : ''}${row.operator} · ${localSpanText(row.startedAt, row.endedAt)} · ${row.cycles} cycles`),
      this.sharing?.target != null ? h('p', { 'data-testid': 'detail-shared' }, sharedCell(row)) : null,
      outcomePanel(row),
      detail.notes ? h('p', {}, detail.notes) : null,
      h('h3', {}, 'Readings'),
      readingRows.length > 0 ? h('table', { class: 'data', 'data-testid': 'detail-readings' }, h('thead', {}, h('tr', {}, ['Step', 'Reading', 'Value', 'Design', 'Verdict'].map((title) => h('th', { scope: 'col' }, title)))), h('tbody', {}, readingRows)) : h('p', { class: 'empty' }, 'No step was recorded in this session.'),
      h('div', { class: 'two-columns' }, h('div', {}, h('h3', {}, 'Transfer curve'), detail.transfer.points.length > 0 ? h('div', { class: 'plot small' }, transferCanvas) : h('p', { class: 'empty', 'data-testid': 'detail-no-transfer' }, 'No transfer curve was recorded in this session.')), h('div', {}, h('h3', {}, perCycleTitle), peaks.length + alphas.length > 0 ? h('div', { class: 'plot small' }, cycleCanvas) : h('p', { class: 'empty' }, 'No per-cycle readings were kept.'))),
      detail.partMeasurements.length > 0 ? h('h3', {}, 'Parts measured on the board') : null,
      detail.partMeasurements.length > 0 ? measuredList : null,
      // A part replaced is no trim: the heading covers both kinds of change.
      h('h3', {}, 'Changes made to the board'),
      detail.trims.length > 0 ? trimList : h('p', { class: 'empty' }, 'None.'),
      h('h3', {}, 'Link events'),
      detail.linkEvents.length > 0 ? h('ul', {}, detail.linkEvents.slice(0, 20).map((event) => h('li', {}, `${new Date(event.at).toLocaleTimeString()} ${event.kind}: ${event.detail}`))) : h('p', { class: 'empty' }, 'None: the link was clean.'),
      exportArea,
    );
    this.detail.hidden = false;
    const transfer = this.chart(transferCanvas, 'Control voltage', 'Firing angle α', (value) => formatSi(value, 'V'), (value) => `${Number(value.toPrecision(4))}°`);
    fixTransferAxis(transfer, detail.transfer.points);
    const fit = detail.transfer.fit;
    transfer.data.datasets = [
      pointsDataset('Points', cssColour('gate'), toPoints(detail.transfer.points), { pointRadius: 2 }),
      lineDataset('Fit', cssColour('control'), fit ? fitLinePoints(fit, fit.controlMinV, fit.controlMaxV) : [], { borderWidth: 2 }),
    ];
    transfer.update('none');
    if (peaks.length + alphas.length > 0) {
      const cycles = peaks.length > 0
        ? this.chart(cycleCanvas, 'Seconds into the session', 'Ramp peak', (value) => `${Number(value.toFixed(1))} s`, (value) => `${Number(value.toFixed(3))} V`)
        : this.chart(cycleCanvas, 'Seconds into the session', 'Firing angle α', (value) => `${Number(value.toFixed(1))} s`, (value) => `${value}°`);
      cycles.data.datasets = [peaks.length > 0 ? lineDataset('Ramp peak', cssColour('ramp'), peaks, { borderWidth: 1.5 }) : lineDataset('Firing angle', cssColour('gate'), alphas, { borderWidth: 1.5 })];
      cycles.update('none');
    }
  }

  private async compare(): Promise<void> {
    if (this.ticked.length !== 2) return;
    const [sessionIdA, sessionIdB] = [...this.ticked].sort((a, b) => a - b);
    const comparison = await runAction(this.context, this.compareButton, () => this.context.client.compareSessions({ sessionIdA, sessionIdB }));
    if (comparison) this.renderComparison(comparison);
  }

  private renderComparison(comparison: SessionComparison): void {
    const canvas = h('canvas', { role: 'img', 'aria-label': `Transfer curves of sessions ${comparison.a.id} and ${comparison.b.id} overlaid`, 'data-testid': 'compare-canvas', 'data-points': String(comparison.transferA.length + comparison.transferB.length) });
    fill(
      this.comparison,
      h('h2', {}, `Session ${comparison.a.id} and session ${comparison.b.id} side by side`),
      h(
        'table',
        { class: 'data', 'data-testid': 'comparison-table' },
        h('thead', {}, h('tr', {}, ['Reading', `#${comparison.a.id} (${comparison.a.unit})`, `#${comparison.b.id} (${comparison.b.unit})`, 'Difference', ''].map((title) => h('th', { scope: 'col' }, title)))),
        (['recorded', 'whole-session'] as const).map((scope) =>
          h(
            'tbody',
            { 'data-scope': scope },
            h('tr', { class: 'group' }, h('th', { scope: 'colgroup', colspan: '5' }, scope === 'recorded' ? 'As recorded at each step (the board as signed for)' : 'Over the whole session (before and after any trim, the whole sweep): not judged')),
            comparison.rows.filter((row) => row.scope === scope).map((row) =>
              h(
                'tr',
                {},
                h('td', {}, row.label),
                h('td', { class: 'number' }, formatReading(row.a, row.unit)),
                h('td', { class: 'number' }, formatReading(row.b, row.unit)),
                h('td', { class: 'number' }, formatReading(row.difference, row.unit)),
                // A difference is judged only where the design gives the figure a tolerance; never a count.
                h('td', {}, !row.judged || row.difference === null ? null : row.beyondTolerance ? h('span', { class: 'flag' }, '✕ beyond tolerance') : h('span', { class: 'muted' }, 'within tolerance')),
              ),
            ),
          ),
        ),
      ),
      h('div', { class: 'plot small' }, canvas),
      h('div', { class: 'plot-caption' }, h('span', {}, h('span', { class: 'swatch gate', 'aria-hidden': 'true' }), `session ${comparison.a.id}`), h('span', {}, h('span', { class: 'swatch control', 'aria-hidden': 'true' }), `session ${comparison.b.id}`)),
    );
    this.comparison.hidden = false;
    this.comparison.scrollIntoView({ block: 'start' });
    const chart = this.chart(canvas, 'Control voltage', 'Firing angle α', (value) => formatSi(value, 'V'), (value) => `${value}°`);
    // The charts take their data as sorted in x (chartSetup: normalized); a sweep goes up and down, so the axis
    // spans every point explicitly rather than the first and last.
    fixTransferAxis(chart, [...comparison.transferA, ...comparison.transferB]);
    chart.data.datasets = [pointsDataset(`Session ${comparison.a.id}`, cssColour('gate'), toPoints(comparison.transferA), { pointRadius: 2 }), pointsDataset(`Session ${comparison.b.id}`, cssColour('control'), toPoints(comparison.transferB), { pointRadius: 2, pointStyle: 'triangle' })];
    chart.update('none');
  }

  private chart(canvas: HTMLCanvasElement, xTitle: string, yTitle: string, xTick: (value: number) => string, yTick: (value: number) => string): LineChart {
    this.replaceCharts();
    const chart = createXyChart(canvas, { xTitle, yTitle, xTick, yTick, tooltip: true });
    this.charts.push(chart);
    return chart;
  }

  /** Charts whose canvas left the page are destroyed (chart.js keeps listeners otherwise). */
  private replaceCharts(): void {
    for (let index = this.charts.length - 1; index >= 0; index--) {
      if (!this.charts[index].canvas.isConnected) {
        this.charts[index].destroy();
        this.charts.splice(index, 1);
      }
    }
  }
}

/** A transfer plot's control axis over all its points (see renderComparison), half a volt either side rounded. */
function fixTransferAxis(chart: LineChart, points: readonly { controlV: number }[]): void {
  const x = chart.options.scales?.x;
  if (!x || points.length === 0) return;
  const range = transferRangeV(points, { fromV: Math.min(...points.map((point) => point.controlV)), toV: Math.max(...points.map((point) => point.controlV)) });
  x.min = range.fromV;
  x.max = range.toV;
}

/** The outcome of one session, with the reason and the steps excepted when it was signed off with exceptions. */
function outcomePanel(row: SessionRow): HTMLElement {
  return h(
    'div',
    { class: `outcome-panel ${row.outcome}`, 'data-testid': 'detail-outcome' },
    h('p', {}, h('strong', {}, outcomeBadge(row.outcome))),
    row.signOffReason !== null ? h('p', {}, 'Reason written at sign-off: ', h('q', { 'data-testid': 'detail-sign-off-reason' }, row.signOffReason)) : null,
    row.signOffExceptions.length > 0 ? h('ul', { 'data-testid': 'detail-sign-off-exceptions' }, row.signOffExceptions.map((exception) => h('li', {}, signOffExceptionText(exception)))) : null,
  );
}

function capitalised(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}
