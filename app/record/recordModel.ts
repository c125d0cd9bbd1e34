/**
 * The commissioning record of one session: what the HTML page and the PDF both show, in one plain object, so the
 * two can never disagree. Built in main/record/buildRecord.ts from the logbook.
 *
 * Capture digest (how the record is checked against the logbook): each stored capture already carries the sha-256
 * of its raw samples (main/store/captureCodec.ts: little-endian float64, channel after channel in `roles` order,
 * before compression). The record's digest is the sha-256 of the UTF-8 text `captureDigestText` builds: the line
 * "rampwright-captures-v1", then one line per capture with its sha-256 in lower-case hex, captures ordered by their
 * start time in the logbook, then their start second in the sample clock, then the hash itself; every line ends
 * with "\n". `rampwright report --verify` recomputes it from the samples themselves.
 */
import type { ReadingCheck } from '../bench/judge';
import { formatPercent } from '../board/formatValues';
import { recordedPartValue } from '../board/partNames';
import { commissioningStepTitles, type FoldCycle, type StepReport, type Verdict } from '../contract/readings';
import type { SessionOutcome, SignOffException } from '../contract/records';
import { verdictWords as verdictText } from '../contract/verdicts';
import type { TransferSet } from './plots';

export interface RecordCapture {
  label: string | null;
  startedAt: string;
  startS: number;
  seconds: number;
  sampleRateHz: number;
  roles: string[];
  sha256: string;
}

export interface CommissioningRecord {
  generatedAt: string;
  unit: { serial: string };
  design: { name: string; version: number; contentHash: string };
  session: {
    id: number;
    operator: string;
    status: string;
    /** How the session ended: signed off, signed off with exceptions, closed without sign-off, interrupted, open. */
    outcome: SessionOutcome;
    /** The written reason of a sign-off with exceptions; null otherwise. */
    signOffReason: string | null;
    signOffExceptions: SignOffException[];
    startedAt: string;
    endedAt: string | null;
    notes: string | null;
    cycles: number;
  };
  /** Readings judged against the design version the session used (app/bench/judge.ts); empty without readings. */
  checks: ReadingCheck[];
  /**
   * The readings table: each step's readings as the technician recorded them when the logbook kept them
   * (`source` 'recorded'), else the checks above from the session's stored readings ('judged').
   */
  readings: { source: 'recorded' | 'judged'; rows: RecordReadingRow[] };
  fold: FoldCycle[];
  transfer: TransferSet & { maxDeviationDeg: number | null };
  /** `name`: the part in words with its designator ("emitter resistor R14"); values in the part's unit (farad for cRamp). */
  trims: Array<{ part: string; name: string; fromOhm: number; toOhm: number; method: string; reason: string; at: string }>;
  /** Part values measured on the board (ohm; farad for cRamp), `name` as above. */
  partMeasurements: Array<{ part: string; name: string; value: number; designValue: number; at: string }>;
  /** Link errors (the logbook's count), seconds the logger was silent, and the events as recorded. */
  link: { errors: number; silentS: number; events: Array<{ kind: string; detail: string; count: number; at: string }> };
  captures: RecordCapture[];
  /** sha-256 of captureDigestText(captures); null when the session kept no capture. */
  capturesSha256: string | null;
}

export const captureDigestVersion = 'rampwright-captures-v1';

export function orderCapturesForDigest<Capture extends { startedAt: string; startS: number; sha256: string }>(captures: readonly Capture[]): Capture[] {
  return [...captures].sort((a, b) => (a.startedAt < b.startedAt ? -1 : a.startedAt > b.startedAt ? 1 : a.startS - b.startS || (a.sha256 < b.sha256 ? -1 : a.sha256 > b.sha256 ? 1 : 0)));
}

/** The exact text whose sha-256 is the record's capture digest (see the file comment). */
export function captureDigestText(captures: ReadonlyArray<{ startedAt: string; startS: number; sha256: string }>): string {
  return [captureDigestVersion, ...orderCapturesForDigest(captures).map((capture) => capture.sha256.toLowerCase())].map((line) => `${line}\n`).join('');
}

/** Verdicts in words and a symbol, never colour alone (NAMING.md); "not measured yet" has neither tick nor cross. */
export const verdictWords: Record<Verdict, { text: string; symbol: string; plain: string }> = {
  'in-tolerance': { text: verdictText['in-tolerance'].phrase, symbol: '\u2713', plain: 'OK' },
  marginal: { text: verdictText.marginal.phrase, symbol: '\u26a0', plain: '!' },
  'out-of-tolerance': { text: verdictText['out-of-tolerance'].phrase, symbol: '\u2717', plain: 'X' },
  'not-measured': { text: verdictText['not-measured'].phrase, symbol: '\u2013', plain: '-' },
};

/** A reading for information whose value is absent: neither a verdict nor a value. */
export const notMeasuredWords = { text: 'not measured', symbol: '\u2013', plain: '-' };

/** A reading the design sets no tolerance for: measured and shown, not judged. */
export const informationWords = { text: 'for information', symbol: 'i', plain: 'i' };

/** The verdict words of a readings-table row: judged, for information (a value without a verdict), or not measured. */
export function rowVerdictWords(row: RecordReadingRow): { text: string; symbol: string; plain: string } {
  if (row.verdict) return verdictWords[row.verdict];
  return row.measured === '-' ? notMeasuredWords : informationWords;
}

export function formatReading(value: number | boolean | null, unit: string): string {
  if (value === null) return '-';
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  const size = Math.abs(value);
  const digits = size === 0 || Number.isInteger(value) ? 0 : size >= 100 ? 1 : size >= 10 ? 2 : 3;
  return `${value.toFixed(digits)}${unit ? ` ${unit}` : ''}`;
}

/** One line of the record's readings table, already in words. */
export interface RecordReadingRow {
  /** The commissioning step it was recorded at; null for readings judged after the session. */
  step: string | null;
  label: string;
  measured: string;
  design: string;
  /** The tolerance band or limit, in words. */
  band: string;
  verdict: Verdict | null;
  note: string;
}


export function readingRowsFromChecks(checks: readonly ReadingCheck[]): RecordReadingRow[] {
  return checks.map((check) => ({
    step: null,
    label: check.label,
    measured: formatReading(check.measured, check.unit),
    design: formatReading(check.expected, check.unit),
    band: formatTolerance(check),
    verdict: check.verdict,
    note: check.note ?? '',
  }));
}

export function readingRowsFromSteps(steps: readonly StepReport[]): RecordReadingRow[] {
  return steps.flatMap((report) =>
    report.readings.map((reading) => {
      const format = (value: number | null) => formatReading(value, reading.unit);
      const band = reading.low !== null && reading.high !== null ? `${format(reading.low)} to ${format(reading.high)}` : reading.low !== null ? `at least ${format(reading.low)}` : reading.high !== null ? `at most ${format(reading.high)}` : '';
      // A judged check without a number (yes/no, a step as recorded) is its words, never a dash beside a verdict.
      const worded = reading.value === null && reading.unit === '' && reading.verdict !== null && reading.note ? reading.note : null;
      return { step: commissioningStepTitles[report.step], label: reading.label, measured: worded ?? format(reading.value), design: format(reading.expected), band, verdict: reading.verdict, note: worded === null ? (reading.note ?? '') : '' };
    }),
  );
}

/** A measured part as the record's table shows it: part, measured, design, how far off (values as marked on parts). */
export function partMeasurementCells(measurement: CommissioningRecord['partMeasurements'][number]): [string, string, string, string] {
  return [capitalised(measurement.name), recordedPartValue(measurement.part, measurement.value), recordedPartValue(measurement.part, measurement.designValue), formatPercent(((measurement.value - measurement.designValue) / measurement.designValue) * 100)];
}

/** A trim as the record's table shows it: part, from, to (the transistor has no value: "replaced"). */
export function trimCells(trim: CommissioningRecord['trims'][number]): [string, string, string] {
  if (trim.part === 'transistor') return [capitalised(trim.name), '-', 'replaced'];
  return [capitalised(trim.name), recordedPartValue(trim.part, trim.fromOhm), recordedPartValue(trim.part, trim.toOhm)];
}

function capitalised(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

export function formatTolerance(check: ReadingCheck): string {
  if (check.toleranceAbs === null) return '';
  if (check.limit) return `limit: ${check.limit === 'at-most' ? 'at most' : 'at least'} ${formatReading(check.expected, check.unit)}`;
  return `\u00b1${formatReading(check.toleranceAbs, check.unit)}`;
}

/** What the record is and is not: it states measurements, it does not certify an installation (our wording). */
export const recordLimitsNote = [
  'This record states what was measured on the unit at the bench, against its stored board design, with the instruments and captures named here.',
  'It does not certify the installation the unit goes into, its wiring, protection or isolation: those follow the local electrical codes and the installer\'s own checks.',
  'Mains-derived signals were taken through an isolated sync source; anyone repeating the measurements must do the same.',
];

/** The record's sentence on the link: errors, and how long the logger was silent, in words. */
export function linkHealthSentence(link: CommissioningRecord['link']): string {
  const errors = link.errors === 0 ? 'No link errors were recorded.' : `${link.errors} link error${link.errors === 1 ? ' was' : 's were'} recorded (see the events).`;
  if (link.silentS <= 0) return errors;
  const stretches = link.events.filter((event) => event.kind === 'link-silent').length;
  return `${errors} The logger sent nothing for ${link.silentS.toFixed(1)} s in ${stretches} stretch${stretches === 1 ? '' : 'es'}: no reading covers that time.`;
}

/** An event's count as the record shows it: a silence's length in seconds, anything else as a number. */
export function linkEventCountText(event: { kind: string; count: number }): string {
  return event.kind === 'link-silent' ? `${(event.count / 1000).toFixed(1)} s` : String(event.count);
}
