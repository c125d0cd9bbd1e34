/**
 * What the Bench screen shows once a session is closed: the record as it was signed (or closed), not live verdicts
 * under the last unit's name. The outcome first, the reason and the steps excepted when there were any, each step
 * as it was recorded with its judged readings, and the way to the record: the Logbook, or the PDF straight away.
 */
import { signOffExceptionText } from '../../app/bench/signOffGate';
import { commissioningStepTitles, type StepReport } from '../../app/contract/readings';
import { outcomeWords, type BenchState } from '../../app/contract/records';
import { stepsBeforeSignOff } from '../../app/bench/signOffGate';
import { base64ToBytes, downloadBytes } from '../dom/download';
import { h, fill } from '../dom/h';
import { verdictBadge } from '../dom/verdictBadge';
import { formatReading } from '../shaping/formatSi';
import { wordedValue } from '../shaping/stepView';
import { runAction, type ScreenContext } from '../shell/screen';

type LastSession = NonNullable<BenchState['lastSession']>;

export class LastSessionPanel {
  readonly element = h('section', { class: 'panel stack last-session', 'aria-labelledby': 'last-session-title', 'data-testid': 'last-session' });
  private shownId: number | null = null;

  constructor(private readonly context: ScreenContext) {}

  /** Shows the session (drawn again only when it is another one), or nothing. */
  render(last: LastSession | null): void {
    this.element.hidden = last === null;
    if (!last || last.row.id === this.shownId) return;
    this.shownId = last.row.id;
    const { row } = last;
    const outcomeIcon = row.outcome === 'signed-off' ? '✓' : row.outcome === 'signed-off-with-exceptions' ? '⚠' : '–';
    const openButton = h('button', { class: 'secondary', type: 'button', 'data-testid': 'last-session-open' }, 'Open in the logbook');
    openButton.addEventListener('click', () => {
      this.context.go('logbook');
      this.context.store.emit('open-session', row.id);
    });
    const pdfButton = h('button', { class: 'primary', type: 'button', 'data-testid': 'last-session-pdf' }, 'Commissioning record (PDF)');
    pdfButton.addEventListener('click', () => void runAction(this.context, pdfButton, async () => {
      const file = await this.context.client.exportSession({ sessionId: row.id, format: 'record-pdf' });
      downloadBytes(file.fileName, file.mediaType, base64ToBytes(file.contentBase64));
    }));
    fill(
      this.element,
      h('h2', { id: 'last-session-title' }, `Last session: unit ${row.unit}`),
      h('p', { class: `outcome-line ${row.outcome}`, 'data-testid': 'last-session-outcome' }, h('span', { class: `outcome ${row.outcome}` }, h('span', { 'aria-hidden': 'true' }, `${outcomeIcon} `), outcomeWords[row.outcome].text)),
      h('p', { class: 'muted' }, `Session ${row.id} · ${row.designName} v${row.designVersion} · ${row.operator} · ended ${row.endedAt ? new Date(row.endedAt).toLocaleTimeString() : '–'}`),
      row.signOffReason !== null ? h('p', {}, 'Reason written at sign-off: ', h('q', {}, row.signOffReason)) : null,
      row.signOffExceptions.length > 0 ? h('ul', { class: 'exceptions' }, row.signOffExceptions.map((exception) => h('li', {}, signOffExceptionText(exception)))) : null,
      h('h3', {}, 'Steps as recorded'),
      h('ol', { class: 'recorded-steps' }, stepsBeforeSignOff.map((step) => recordedStep(commissioningStepTitles[step], last.steps.find((report) => report.step === step) ?? null))),
      h('div', { class: 'row' }, pdfButton, openButton),
      h('p', { class: 'muted' }, 'Start the next unit with the form above; its steps and live verdicts appear once its session is open.'),
    );
  }
}

/** One recorded step: its verdict as recorded and its judged readings (information readings are in the record). */
function recordedStep(title: string, report: StepReport | null): HTMLElement {
  if (!report) return h('li', {}, h('span', { class: 'name' }, title), ' ', h('span', { class: 'muted' }, 'not recorded'));
  const judged = report.readings.filter((reading) => reading.verdict !== null);
  return h(
    'li',
    {},
    h('span', { class: 'name' }, title), ' ', verdictBadge(report.verdict),
    judged.length > 0 ? h('div', { class: 'muted small' }, judged.map((reading) => `${reading.label} ${wordedValue(reading) ?? formatReading(reading.value, reading.unit)}`).join(' · ')) : null,
  );
}
