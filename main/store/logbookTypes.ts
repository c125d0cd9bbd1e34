/**
 * The logbook as the rest of Rampwright sees it: the only way in, for the screens, the commands, the commissioning
 * record, recall and exchange (no caller outside main/store touches a database). The bench keeps it in SQLite
 * (sqliteLogbook.ts); a workshop that shares one logbook between benches implements the same interface over
 * PostgreSQL (ARCHITECTURE.md, "Growth beyond one bench"), so nothing above main/store changes. Every query is async
 * for that reason, even though the SQLite one answers synchronously; the session writer's add* calls only queue in
 * memory, so the live recording path never waits on either. Field names follow the bench API contract's records (app/contract/records.ts).
 * Times cross this interface as ISO 8601 strings (UTC).
 */
import type { CaptureReadings, CycleReading } from '../../app/bench/readings';
import type { BoardDesign } from '../../app/board/design';
import type { SampleBlock, SignalRole } from '../../app/capture/samples';
import type { LinkProblemCode } from '../../app/logger';
import type { SessionOutcome, SignOffException } from '../../app/contract/records';
import type { RecordedFigures } from './recordedFigures';
import type { ArchiveSession } from '../../app/exchange/archiveSchema';

export type SessionStatus = 'open' | 'closed' | 'interrupted';

/** How a session ended (app/contract/records.ts): its status, or for a closed one whether and how it was signed off. */
export type { SessionOutcome, SignOffException } from '../../app/contract/records';

/** What `close` records with a sign-off (app/bench/signOffGate.ts decides which kind). */
export type SessionSignOff =
  | { kind: 'signed-off' }
  | { kind: 'signed-off-with-exceptions'; reason: string; exceptions: SignOffException[] };

export interface DesignVersion {
  id: number;
  name: string;
  /** 1, 2, 3... per design name, in the order distinct contents were first saved. */
  version: number;
  /** sha-256 of the design's canonical JSON (keys sorted): the identity of this exact version. */
  contentHash: string;
  savedAt: string;
}

/** A design version as stored: its canonical JSON (the commissioning record, recall and exchange read it). */
export interface StoredDesignVersion {
  id: number;
  name: string;
  version: number;
  contentHash: string;
  designJson: string;
  savedAtMs: number;
}

export interface UnitRecord {
  serial: string;
  designName: string | null;
  sessions: number;
  lastSessionAt: string | null;
}

export interface SessionRow {
  id: number;
  unit: string;
  designName: string;
  designVersion: number;
  operator: string;
  status: SessionStatus;
  /** The status, or for a closed session whether it was signed off, plainly or with exceptions. */
  outcome: SessionOutcome;
  /** The written reason of a sign-off with exceptions; null otherwise. */
  signOffReason: string | null;
  /** The steps excepted at sign-off; empty unless signed off with exceptions. */
  signOffExceptions: SignOffException[];
  startedAt: string;
  endedAt: string | null;
  /** Cycles measured over the whole session: a count, judged by nothing. */
  cycles: number;
  /** Ramp peak as recorded at the ramp step (after any trim, re-checked): recordedFigures.ts. */
  rampPeakV: number | null;
  /** Smallest and largest alpha as recorded at the limits step. */
  alphaMinDeg: number | null;
  alphaMaxDeg: number | null;
  /**
   * Over every cycle of the session, before and after a trim and through a whole sweep: the median per-cycle ramp
   * peak (the analysis' `ramp.peakV`) and the mean firing angle. Not the board as signed for; labelled so.
   */
  wholeSession: { rampPeakMedianV: number | null; alphaMeanDeg: number | null };
  /** Sum of the counts of link events that mean something went wrong (see linkErrorKinds). */
  linkErrors: number;
  /** Seconds the logger sent nothing (the `link-silent` rows), 0 for a link that never went quiet. */
  linkSilentS: number;
  /** The bench that recorded it (null for sessions recorded before benches were named). */
  bench: string | null;
  /** When this bench last pushed it to a shared logbook (null: not yet shared, or not a bench's own logbook). */
  sharedAt: string | null;
}

/** One stored cycle as recall shows it. */
export interface CycleRecord {
  t: number;
  alphaDeg: number | null;
  rampPeakV: number | null;
  controlV: number | null;
}

export interface TransferPointRecord {
  t: number;
  controlV: number;
  alphaDeg: number;
}

export interface TransferFitRecord {
  gainDegPerV: number;
  offsetDeg: number;
  maxDeviationDeg: number;
  controlMinV: number;
  controlMaxV: number;
  points: number;
}

export interface TrimRecord {
  id: number;
  part: string;
  /**
   * The part's value before and after, in its own unit as the part measurements keep them: ohm, or farad for the ramp
   * capacitor (`cRamp`, replaced with its design value); 0 for `transistor` (a replaced ramp transistor has no value).
   */
  fromOhm: number;
  toOhm: number;
  /** How the value was chosen: 'trim plan', 'by hand', ... */
  method: string;
  reason: string;
  at: string;
}

/** A part value measured on the board (ohm; farad for cRamp), beside what the design asks for there. */
export interface PartMeasurementRecord {
  part: string;
  value: number;
  designValue: number;
  at: string;
}

export type LinkEventKind =
  | 'opened'
  | 'closed'
  | 'reopened'
  | 'unplugged'
  | 'watchdog-timeout'
  | 'lines-dropped'
  | 'line-too-long'
  | 'link-error'
  | 'crc-failures'
  | 'sequence-gap'
  | 'samples-lost'
  | 'garbage'
  | 'logger-overrun'
  | 'decoder-problem'
  /** A stretch with no data from the logger; `count` holds its length in milliseconds, `at` its start. */
  | 'link-silent'
  /** Data lines of a logger that was already streaming, before its greeting was asked for and came. */
  | 'waiting-for-greeting'
  /** The first line after the port opened, cut by the opening itself (the logger was mid-line). */
  | 'partial-line-at-open';

/**
 * The kinds whose counts add up to a session's `linkErrors`: data damaged or lost on the way. A silent logger is
 * measured as `link-silent` time instead (its watchdog timeouts are a symptom of it, not errors of their own), and
 * joining a logger that was already streaming (a cut first line, data before the greeting) is no error at all.
 */
export const linkErrorKinds: readonly LinkEventKind[] = [
  'unplugged',
  'lines-dropped',
  'line-too-long',
  'link-error',
  'crc-failures',
  'sequence-gap',
  'garbage',
  'logger-overrun',
  'decoder-problem',
];

export function isLinkErrorKind(kind: LinkEventKind): boolean {
  return linkErrorKinds.includes(kind);
}

/** The logbook kind of each decoder problem (app/logger/health.ts); the rest are 'decoder-problem'. */
export const linkEventKindOfProblem: Partial<Record<LinkProblemCode, LinkEventKind>> = {
  crc: 'crc-failures',
  'sequence-gap': 'sequence-gap',
  garbage: 'garbage',
  'logger-overrun': 'logger-overrun',
  oversize: 'line-too-long',
  'data-before-greeting': 'waiting-for-greeting',
};

export interface LinkEventRecord {
  kind: LinkEventKind;
  detail: string;
  /** How many occurrences this row stands for (a burst of CRC failures is one row). */
  count: number;
  at: string;
}

export interface CaptureInfo {
  id: number;
  label: string | null;
  startS: number;
  seconds: number;
  sampleRateHz: number;
  roles: SignalRole[];
  startedAt: string;
  /** sha-256 (hex) of the raw samples as stored: little-endian float64, channel after channel in `roles` order. */
  sha256: string;
}

export interface StoredCapture {
  info: CaptureInfo;
  block: SampleBlock;
}

export interface SessionDetail {
  row: SessionRow;
  notes: string | null;
  designId: number;
  readings: CaptureReadings | null;
  /** The step reports as recorded at each step's check (JSON of the contract's StepReport[]), null before any. */
  stepsJson: string | null;
  transfer: { points: TransferPointRecord[]; fit: TransferFitRecord | null };
  trims: TrimRecord[];
  partMeasurements: PartMeasurementRecord[];
  linkEvents: LinkEventRecord[];
  captures: CaptureInfo[];
}

export interface SessionFilter {
  unitSerial?: string;
  designName?: string;
  /** Sessions started at or after this instant (ISO 8601). */
  from?: string;
  /** Sessions started before this instant (ISO 8601). */
  to?: string;
  /** Only the newest this many of the matching sessions (still given oldest first): a shared logbook holds a line's. */
  newest?: number;
}

/**
 * The figures a unit's sessions are compared, trended and placed in a fleet by: as recorded at each step (the board
 * as signed for, recordedFigures.ts), and apart from them the whole session's figures, labelled as such.
 */
export interface SessionFigures extends RecordedFigures {
  sessionId: number;
  startedAt: string;
  /** Cycles measured over the whole session: a count. */
  cycles: number;
  wholeSession: WholeSessionFigures;
}

/** Over every cycle of a session (before and after a trim, a whole control sweep included). */
export interface WholeSessionFigures {
  /** Median of the per-cycle ramp peaks. */
  rampPeakMedianV: number | null;
  /** Mean of the per-cycle slopes. */
  slopeMeanVPerMs: number | null;
  alphaMeanDeg: number | null;
  /** Sample standard deviation of alpha over the session: the spread of a control sweep, not firing jitter. */
  alphaSpreadDeg: number | null;
}

export interface ComparisonRow {
  key: string;
  label: string;
  unit: string;
  /** 'recorded': as recorded at the steps; 'whole-session': over every cycle, labelled so on screen. */
  scope: 'recorded' | 'whole-session';
  a: number | null;
  b: number | null;
  difference: number | null;
  /** True when the design gives this figure a tolerance, so a difference can be judged; counts never are. */
  judged: boolean;
  /** True when |b - a| exceeds the tolerance of the design version session a used (never when not judged). */
  beyondTolerance: boolean;
}

export interface SessionComparison {
  a: SessionRow;
  b: SessionRow;
  rows: ComparisonRow[];
  transferA: TransferPointRecord[];
  transferB: TransferPointRecord[];
}

/** Least-squares straight line of one figure against days since the unit's first session. */
export interface DriftTrend {
  perDay: number;
  /** Standard error of `perDay` (null with fewer than three sessions). */
  perDayStandardError: number | null;
  intercept: number;
  sessions: number;
}

export interface UnitDrift {
  unit: string;
  points: SessionFigures[];
  rampPeakV: DriftTrend | null;
  alphaGainDegPerV: DriftTrend | null;
}

export interface StartSessionRequest {
  unitSerial: string;
  design: BoardDesign;
  operator: string;
  notes?: string;
  /** Defaults to now. */
  startedAt?: Date;
  /** The bench recording it; defaults to benchName() (the RAMPWRIGHT_BENCH setting or the host name). */
  bench?: string;
}

/** A finished session of this logbook pushed to a shared one. */
export interface SharedCopy {
  sessionId: number;
  /** The shared logbook's address, without any password. */
  target: string;
  contentSha256: string;
  /** The session's id in the shared logbook. */
  remoteSessionId: number;
}

export interface LogbookWriterStats {
  /** Items waiting in memory for the next batch. */
  queued: number;
  cyclesWritten: number;
  batches: number;
  /** Cycles discarded because the queue was full (the disk stopped accepting writes). */
  cyclesDropped: number;
  lastBatchMs: number;
  longestBatchMs: number;
  lastError: string | null;
  /**
   * Set when the store refused the last batch for a reason that will not pass by waiting: the disk is full, the
   * file became read-only or damaged. A lock held by another process is not one (the writer retries).
   */
  writeFailure: { kind: 'disk-full' | 'read-only' | 'damaged' | 'io'; message: string } | null;
}

/**
 * One session being recorded. The add* calls only queue in memory and return at once, so the serial reader never
 * waits on the disk; batches go to the store in one transaction at least every `flushIntervalMs` (default 200 ms).
 */
export interface LogbookWriter {
  readonly sessionId: number;
  addCycle(reading: CycleReading): void;
  addTransferPoint(point: TransferPointRecord): void;
  addLinkEvent(kind: LinkEventKind, detail: string, count?: number): void;
  addTrim(trim: Omit<TrimRecord, 'id' | 'at'> & { at?: Date }): void;
  addPartMeasurement(measurement: Omit<PartMeasurementRecord, 'at'> & { at?: Date }): void;
  addCapture(block: SampleBlock, label?: string): void;
  setReadings(readings: CaptureReadings): void;
  /** The recorded step reports so far, as JSON (each call replaces the last). */
  setStepsJson(json: string): void;
  setNotes(notes: string): void;
  stats(): LogbookWriterStats;
  /** Writes everything queued now. */
  flush(): Promise<void>;
  /**
   * Writes everything queued, then ends the session with this status (default 'closed'); a sign-off goes with a
   * closed session only, in the same transaction as its end. After a write failure (stats().writeFailure) what is
   * queued is given up, and the session is ended with `note` added to its notes (why it stopped), using the space
   * the writer kept in reserve.
   */
  close(status?: Exclude<SessionStatus, 'open'>, signOff?: SessionSignOff, options?: { note?: string }): Promise<SessionRow>;
}

/** A finished session in the archive's shape (app/exchange/ARCHIVE.md): rows without local ids, captures' stored bytes. */
export interface ArchiveSessionContent {
  session: ArchiveSession;
  captureData: Buffer[];
}

/** A checked archive to import (main/exchange/sessionArchive.ts checks it before the store sees it). */
export interface ArchiveImportRequest extends ArchiveSessionContent {
  contentSha256: string;
  /** Where the archive came from, for messages. */
  where: string;
}

export interface ArchiveImportResult {
  sessionId: number;
  contentSha256: string;
  /** False when the session was already in the logbook (nothing changed). */
  imported: boolean;
}

export interface Logbook {
  /** The file or address of the store, for messages (never with a password in it). */
  readonly location: string;
  saveDesign(design: BoardDesign): Promise<DesignVersion>;
  /** A design version by id; InputError when this logbook has none. */
  designVersion(designId: number): Promise<StoredDesignVersion>;
  /** The newest version of a design name, or null. */
  latestDesignVersion(designName: string): Promise<StoredDesignVersion | null>;
  /** Each unit's latest session among those that used any version of the design (a fleet view's units). */
  latestSessionPerUnit(designName: string): Promise<Array<{ unit: string; sessionId: number }>>;
  listUnits(): Promise<UnitRecord[]>;
  startSession(request: StartSessionRequest, options?: { flushIntervalMs?: number; maxQueuedItems?: number }): Promise<LogbookWriter>;
  listSessions(filter?: SessionFilter): Promise<SessionRow[]>;
  session(id: number): Promise<SessionDetail | null>;
  transferCurve(sessionId: number): Promise<TransferPointRecord[]>;
  /** The session's per-cycle readings in order, thinned evenly to at most `maxRows` (default all). */
  cycleReadings(sessionId: number, options?: { maxRows?: number }): Promise<CycleRecord[]>;
  readCapture(captureId: number): Promise<StoredCapture | null>;
  sessionFigures(sessionId: number): Promise<SessionFigures | null>;
  compareSessions(aId: number, bId: number): Promise<SessionComparison>;
  unitDrift(unitSerial: string): Promise<UnitDrift>;
  /** A finished session as its archive carries it; InputError for an unknown or still open session. */
  archiveSession(sessionId: number): Promise<ArchiveSessionContent>;
  /** The content hash of a finished session (what its archive would carry). */
  sessionContentHash(sessionId: number): Promise<string>;
  /**
   * Adds an archived session unless it is here already (same unit, start and content hash: nothing changes), in
   * one transaction; the same unit and start with other content is refused (ARCHIVE.md, import rules).
   */
  importArchiveSession(request: ArchiveImportRequest): Promise<ArchiveImportResult>;
  /** Finished sessions not yet pushed to `target`, oldest first. */
  sessionsToShare(target: string): Promise<number[]>;
  /** Notes that a finished session is now in the shared logbook `target`. */
  recordSharedCopy(copy: SharedCopy): Promise<void>;
  /** Marks 'open' sessions whose writer is gone as 'interrupted'; returns their ids. Runs on every open too. */
  recoverInterruptedSessions(): Promise<number[]>;
  close(): Promise<void>;
}
