/**
 * The session writer: an in-memory queue that a timer drains into SQLite in one transaction per batch. Adding only
 * pushes onto an array, so the serial reader never waits on the disk; a batch of a few hundred rows through prepared
 * statements takes a millisecond or so (scripts/bench/store.ts prints the figures). A process killed at any moment
 * loses at most what was queued since the last batch: `flushIntervalMs` (default 200 ms, well inside the one second
 * the logbook promises, leaving room for a loaded machine).
 */
import { hostname } from 'node:os';
import { performance } from 'node:perf_hooks';
import type { CaptureReadings, CycleReading } from '../../app/bench/readings';
import type { SampleBlock } from '../../app/capture/samples';
import { captureEncoding, encodeCapture } from './captureCodec';
import type { LinkEventKind, LogbookWriter, LogbookWriterStats, PartMeasurementRecord, SessionRow, SessionStatus, TransferPointRecord, TrimRecord } from './logbookTypes';
import type { SqliteDatabase } from './openDatabase';
import { storeSessionSummary } from './sessionSummary';
import type { SpaceReserve } from './spaceReserve';
import { storageFaultOf } from './storageFaults';
import { InputError } from '../../app/errors';

type QueueItem =
  | { kind: 'cycle'; reading: CycleReading; atMs: number }
  | { kind: 'transfer'; point: TransferPointRecord }
  | { kind: 'link'; eventKind: LinkEventKind; detail: string; count: number; atMs: number }
  | { kind: 'trim'; trim: Omit<TrimRecord, 'id' | 'at'>; atMs: number }
  | { kind: 'measurement'; measurement: Omit<PartMeasurementRecord, 'at'>; atMs: number }
  | { kind: 'capture'; block: SampleBlock; label: string | null; atMs: number }
  | { kind: 'readings'; json: string }
  | { kind: 'steps'; json: string }
  | { kind: 'notes'; notes: string };

export interface LogbookWriterOptions {
  flushIntervalMs?: number;
  /** Beyond this many queued items (the disk refuses writes) new cycles are dropped and counted. Default 500 000. */
  maxQueuedItems?: number;
  /** Where `close()` gets the finished session's row. */
  readRow: (sessionId: number) => SessionRow;
  /** The logbook's file, for messages. */
  location?: string;
  /** Space kept for ending the session when the disk fills (spaceReserve.ts); released when the session ends. */
  reserve?: SpaceReserve;
}

export function writerIdentity(): { host: string; pid: number } {
  return { host: hostname(), pid: process.pid };
}

export function createSqliteLogbookWriter(db: SqliteDatabase, sessionId: number, options: LogbookWriterOptions): LogbookWriter {
  const flushIntervalMs = options.flushIntervalMs ?? 200;
  const maxQueuedItems = options.maxQueuedItems ?? 500_000;
  const insertCycle = db.prepare(
    `INSERT INTO cycles (session_id, seq, t_s, half_cycle, period_s, alpha_deg, control_v, pulses, wrong_half_cycle_pulses,
      ramp_peak_v, ramp_floor_v, slope_v_per_ms, start_delay_deg, nonlinearity_pct, clipped, reset_us, recorded_at_ms)
     VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
  );
  const insertTransfer = db.prepare('INSERT INTO transfer_points (session_id, seq, t_s, control_v, alpha_deg) VALUES (?, ?, ?, ?, ?)');
  const insertLink = db.prepare('INSERT INTO link_events (session_id, kind, detail, count, at_ms) VALUES (?, ?, ?, ?, ?)');
  const insertTrim = db.prepare('INSERT INTO trims (session_id, part, from_ohm, to_ohm, method, reason, at_ms) VALUES (?, ?, ?, ?, ?, ?, ?)');
  const insertMeasurement = db.prepare('INSERT INTO part_measurements (session_id, part, value, design_value, at_ms) VALUES (?, ?, ?, ?, ?)');
  const insertCapture = db.prepare(
    `INSERT INTO captures (session_id, label, start_s, sample_rate_hz, samples_per_channel, roles, after_gap, started_at_ms, encoding, sha256, data)
     VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
  );
  const updateReadings = db.prepare('UPDATE sessions SET readings_json = ? WHERE id = ?');
  const updateSteps = db.prepare('UPDATE sessions SET steps_json = ? WHERE id = ?');
  const updateNotes = db.prepare('UPDATE sessions SET notes = ? WHERE id = ?');
  const heartbeat = db.prepare('UPDATE sessions SET heartbeat_at_ms = ? WHERE id = ?');
  const nextSeq = (table: 'cycles' | 'transfer_points'): number =>
    (db.prepare(`SELECT coalesce(max(seq) + 1, 0) AS next FROM ${table} WHERE session_id = ?`).get(sessionId) as { next: number }).next;

  let cycleSeq = nextSeq('cycles');
  let transferSeq = nextSeq('transfer_points');
  let queue: QueueItem[] = [];
  let closed = false;
  const stats: LogbookWriterStats = { queued: 0, cyclesWritten: 0, batches: 0, cyclesDropped: 0, lastBatchMs: 0, longestBatchMs: 0, lastError: null, writeFailure: null };
  const location = options.location ?? 'logbook';
  const appendNote = db.prepare("UPDATE sessions SET notes = CASE WHEN notes IS NULL OR notes = '' THEN ? ELSE notes || char(10) || ? END WHERE id = ?");

  const writeItem = (item: QueueItem): void => {
    switch (item.kind) {
      case 'cycle': {
        const r = item.reading;
        insertCycle.run(
          sessionId, cycleSeq, r.t, r.halfCycle, r.periodS, r.alphaDeg, r.controlV, r.pulses, r.wrongHalfCyclePulses, r.rampPeakV, r.rampFloorV,
          r.slopeVPerMs, r.startDelayDeg, r.nonlinearityPct, r.clipped === null ? null : r.clipped ? 1 : 0, r.resetUs, item.atMs,
        );
        cycleSeq += 1;
        return;
      }
      case 'transfer':
        insertTransfer.run(sessionId, transferSeq, item.point.t, item.point.controlV, item.point.alphaDeg);
        transferSeq += 1;
        return;
      case 'link':
        insertLink.run(sessionId, item.eventKind, item.detail, item.count, item.atMs);
        return;
      case 'trim':
        insertTrim.run(sessionId, item.trim.part, item.trim.fromOhm, item.trim.toOhm, item.trim.method, item.trim.reason, item.atMs);
        return;
      case 'measurement':
        insertMeasurement.run(sessionId, item.measurement.part, item.measurement.value, item.measurement.designValue, item.atMs);
        return;
      case 'capture': {
        const encoded = encodeCapture(item.block);
        insertCapture.run(
          sessionId, item.label, item.block.startS, item.block.sampleRateHz, encoded.samplesPerChannel, JSON.stringify(encoded.roles),
          item.block.afterGap ? 1 : 0, item.atMs, captureEncoding, encoded.sha256, encoded.data,
        );
        return;
      }
      case 'readings':
        updateReadings.run(item.json, sessionId);
        return;
      case 'steps':
        updateSteps.run(item.json, sessionId);
        return;
      case 'notes':
        updateNotes.run(item.notes, sessionId);
        return;
    }
  };

  const writeBatch = db.transaction((batch: QueueItem[]) => {
    for (const item of batch) writeItem(item);
    heartbeat.run(Date.now(), sessionId);
  });

  let lastHeartbeatMs = 0;
  function flushNow(): void {
    if (queue.length === 0 && Date.now() - lastHeartbeatMs < 5000) return;
    const batch = queue;
    queue = [];
    const started = performance.now();
    const seqBefore = { cycle: cycleSeq, transfer: transferSeq };
    try {
      writeBatch(batch);
      lastHeartbeatMs = Date.now();
      stats.batches += 1;
      stats.cyclesWritten += cycleSeq - seqBefore.cycle;
      stats.lastError = null;
      stats.writeFailure = null;
    } catch (error) {
      // The transaction rolled back: put the batch back in front and try again on the next tick.
      cycleSeq = seqBefore.cycle;
      transferSeq = seqBefore.transfer;
      queue = batch.concat(queue);
      stats.lastError = error instanceof Error ? error.message : String(error);
      const fault = storageFaultOf(error, location);
      if (fault) stats.writeFailure = { kind: fault.kind, message: `${location}: ${fault.message}` };
    }
    stats.lastBatchMs = performance.now() - started;
    stats.longestBatchMs = Math.max(stats.longestBatchMs, stats.lastBatchMs);
  }

  const timer = setInterval(flushNow, flushIntervalMs);
  timer.unref();

  const enqueue = (item: QueueItem): void => {
    if (closed) throw new Error(`session ${sessionId} is closed: nothing more can be added`);
    if (item.kind === 'cycle' && queue.length >= maxQueuedItems) {
      stats.cyclesDropped += 1;
      return;
    }
    queue.push(item);
  };

  return {
    sessionId,
    addCycle: (reading) => enqueue({ kind: 'cycle', reading, atMs: Date.now() }),
    addTransferPoint: (point) => enqueue({ kind: 'transfer', point: { ...point } }),
    addLinkEvent: (eventKind, detail, count = 1) => enqueue({ kind: 'link', eventKind, detail, count, atMs: Date.now() }),
    addTrim: (trim) => enqueue({ kind: 'trim', trim: { part: trim.part, fromOhm: trim.fromOhm, toOhm: trim.toOhm, method: trim.method, reason: trim.reason }, atMs: (trim.at ?? new Date()).getTime() }),
    addPartMeasurement: (measurement) => enqueue({ kind: 'measurement', measurement: { part: measurement.part, value: measurement.value, designValue: measurement.designValue }, atMs: (measurement.at ?? new Date()).getTime() }),
    addCapture: (block, label) => enqueue({ kind: 'capture', block, label: label ?? null, atMs: Date.now() }),
    setReadings: (readings: CaptureReadings) => enqueue({ kind: 'readings', json: JSON.stringify(readings) }),
    setStepsJson: (json) => enqueue({ kind: 'steps', json }),
    setNotes: (notes) => enqueue({ kind: 'notes', notes }),
    stats: () => ({ ...stats, queued: queue.length }),
    async flush() {
      flushNow();
      if (stats.lastError !== null) throw new Error(`logbook write failed: ${stats.lastError}`);
    },
    async close(status: Exclude<SessionStatus, 'open'> = 'closed', closeOptions: { note?: string } = {}) {
      if (closed) return options.readRow(sessionId);
      flushNow();
      const failure = stats.writeFailure;
      if (stats.lastError !== null && failure === null) throw new Error(`logbook write failed: ${stats.lastError}`);
      closed = true;
      clearInterval(timer);
      if (failure !== null) {
        // What the store refused stays unwritten; the reserve makes room to end the session with why it stopped.
        queue = [];
        options.reserve?.release();
      }
      try {
        db.transaction(() => {
          storeSessionSummary(db, sessionId, status, Date.now());
          if (closeOptions.note) appendNote.run(closeOptions.note, closeOptions.note, sessionId);
        })();
      } catch (error) {
        const fault = storageFaultOf(error, location);
        if (!fault) throw error;
        throw new InputError(`${fault.message}; session ${sessionId} could not be ended and will show as interrupted when the logbook is next opened with room to write`, location);
      } finally {
        options.reserve?.release();
      }
      return options.readRow(sessionId);
    },
  };
}
