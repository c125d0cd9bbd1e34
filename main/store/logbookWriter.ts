/**
 * The session writer, for both stores: an in-memory queue that a timer drains into the logbook in one write
 * transaction per batch (multi-row inserts: one round trip per few hundred rows on a shared logbook). Adding only
 * pushes onto an array, so the serial reader never waits on the disk or the network; a batch of a few hundred rows
 * takes a millisecond or so on SQLite (scripts/bench/store.ts prints the figures). A process killed at any moment
 * loses at most what was queued since the last batch: `flushIntervalMs` (default 200 ms, well inside the one second
 * the logbook promises, leaving room for a loaded machine). A batch the store refuses (SQLite locked by another
 * program, a shared logbook's server gone) goes back to the front of the queue and is tried again on the next tick.
 */
import { performance } from 'node:perf_hooks';
import { InputError } from '../../app/errors';
import type { CaptureReadings, CycleReading } from '../../app/bench/readings';
import type { SampleBlock } from '../../app/capture/samples';
import { captureEncoding, encodeCapture } from './captureCodec';
import { insertRows } from './exchangeRows';
import type { SessionWriterOptions } from './logbookOverEngine';
import type { LinkEventKind, LogbookWriter, LogbookWriterStats, PartMeasurementRecord, SessionSignOff, SessionStatus, TransferPointRecord, TrimRecord } from './logbookTypes';
import { storeSessionSummary, storeSignOff } from './sessionSummary';
import type { SpaceReserve } from './spaceReserve';
import { get, run, type SqlProgram, type SqlValue } from './sqlProgram';
import type { StorageFault } from './storageFaults';

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

export interface BatchingWriterOptions extends SessionWriterOptions {
  /** Runs a program in one write transaction of the store. */
  write<T>(program: SqlProgram<T>): Promise<T>;
  /**
   * The same, waiting longer for another process's lock: used once the session is being closed, where the caller
   * waits and no later tick will try again (SQLite; without it, `write`).
   */
  writeAwaited?<T>(program: SqlProgram<T>): Promise<T>;
  /** The store's reading of a refused batch: a fault waiting will not cure (disk full, read-only, damaged), or null. */
  faultOf?: (error: unknown) => StorageFault | null;
  /** Space kept for ending the session when the disk fills (spaceReserve.ts); released when the session ends. */
  reserve?: SpaceReserve | null;
}

const cycleColumns = ['seq', 't_s', 'half_cycle', 'period_s', 'alpha_deg', 'control_v', 'pulses', 'wrong_half_cycle_pulses', 'ramp_peak_v', 'ramp_floor_v', 'slope_v_per_ms', 'start_delay_deg', 'nonlinearity_pct', 'clipped', 'reset_us', 'recorded_at_ms'];
const captureColumns = ['label', 'start_s', 'sample_rate_hz', 'samples_per_channel', 'roles', 'after_gap', 'started_at_ms', 'encoding', 'sha256', 'data'];

/**
 * One batch as rows per table, in queue order within each table; the last readings, steps and notes win. The batch
 * sets the session's heartbeat to its own stamp, so a batch tried again after a connection lost at COMMIT (did it
 * commit or not?) finds its stamp there when it did, and writes nothing twice.
 */
function* writeBatch(sessionId: number, batch: readonly QueueItem[], firstSeq: { cycle: number; transfer: number }, stamp: number): SqlProgram<void> {
  const current = yield* get<{ stamp: number | null }>('SELECT heartbeat_at_ms AS "stamp" FROM sessions WHERE id = ?', [sessionId]);
  if (current?.stamp === stamp) return;
  const rows: Record<'cycles' | 'transfers' | 'links' | 'trims' | 'measurements' | 'captures', SqlValue[][]> = { cycles: [], transfers: [], links: [], trims: [], measurements: [], captures: [] };
  const updates = new Map<'readings_json' | 'steps_json' | 'notes', string>();
  for (const item of batch) {
    switch (item.kind) {
      case 'cycle': {
        const r = item.reading;
        rows.cycles.push([
          firstSeq.cycle + rows.cycles.length, r.t, r.halfCycle, r.periodS, r.alphaDeg, r.controlV, r.pulses, r.wrongHalfCyclePulses, r.rampPeakV, r.rampFloorV,
          r.slopeVPerMs, r.startDelayDeg, r.nonlinearityPct, r.clipped === null ? null : r.clipped ? 1 : 0, r.resetUs, item.atMs,
        ]);
        break;
      }
      case 'transfer':
        rows.transfers.push([firstSeq.transfer + rows.transfers.length, item.point.t, item.point.controlV, item.point.alphaDeg]);
        break;
      case 'link':
        rows.links.push([item.eventKind, item.detail, item.count, item.atMs]);
        break;
      case 'trim':
        rows.trims.push([item.trim.part, item.trim.fromOhm, item.trim.toOhm, item.trim.method, item.trim.reason, item.atMs]);
        break;
      case 'measurement':
        rows.measurements.push([item.measurement.part, item.measurement.value, item.measurement.designValue, item.atMs]);
        break;
      case 'capture': {
        const encoded = encodeCapture(item.block);
        rows.captures.push([item.label, item.block.startS, item.block.sampleRateHz, encoded.samplesPerChannel, JSON.stringify(encoded.roles), item.block.afterGap ? 1 : 0, item.atMs, captureEncoding, encoded.sha256, encoded.data]);
        break;
      }
      case 'readings':
        updates.set('readings_json', item.json);
        break;
      case 'steps':
        updates.set('steps_json', item.json);
        break;
      case 'notes':
        updates.set('notes', item.notes);
        break;
    }
  }
  yield* insertRows('cycles', sessionId, cycleColumns, rows.cycles);
  yield* insertRows('transfer_points', sessionId, ['seq', 't_s', 'control_v', 'alpha_deg'], rows.transfers);
  yield* insertRows('link_events', sessionId, ['kind', 'detail', 'count', 'at_ms'], rows.links);
  yield* insertRows('trims', sessionId, ['part', 'from_ohm', 'to_ohm', 'method', 'reason', 'at_ms'], rows.trims);
  yield* insertRows('part_measurements', sessionId, ['part', 'value', 'design_value', 'at_ms'], rows.measurements);
  yield* insertRows('captures', sessionId, captureColumns, rows.captures);
  for (const [column, value] of updates) yield* run(`UPDATE sessions SET ${column} = ? WHERE id = ?`, [value, sessionId]);
  yield* run('UPDATE sessions SET heartbeat_at_ms = ? WHERE id = ?', [stamp, sessionId]);
}

/** Ends the session: its sign-off if any, its summary, and a note of why it stopped added to its notes. */
function* endSession(sessionId: number, status: Exclude<SessionStatus, 'open'>, signOff: SessionSignOff | null, note: string | null): SqlProgram<void> {
  if (signOff) yield* storeSignOff(sessionId, signOff);
  yield* storeSessionSummary(sessionId, status, Date.now());
  if (note !== null) {
    yield* run("UPDATE sessions SET notes = CASE WHEN notes IS NULL OR notes = '' THEN ? ELSE notes || ? END WHERE id = ?", [note, `\n${note}`, sessionId]);
  }
}

export function createBatchingWriter(sessionId: number, options: BatchingWriterOptions): LogbookWriter {
  const flushIntervalMs = options.flushIntervalMs ?? 200;
  const maxQueuedItems = options.maxQueuedItems ?? 500_000;
  // A writer is opened for a session just started: its sequences begin at 0.
  const seq = { cycle: 0, transfer: 0 };
  let queue: QueueItem[] = [];
  /** A batch the store refused, tried again alone with its stamp before anything newer. */
  let refused: { items: QueueItem[]; stamp: number } | null = null;
  // Later than the heartbeat the session was started with, so no stamp can match that one.
  let lastStamp = Date.now();
  let closed = false;
  let closing = false;
  const writeNow = <T>(program: SqlProgram<T>): Promise<T> => (closing && options.writeAwaited ? options.writeAwaited(program) : options.write(program));
  let inFlight: Promise<void> | null = null;
  let lastHeartbeatMs = 0;
  const stats: LogbookWriterStats = { queued: 0, cyclesWritten: 0, batches: 0, cyclesDropped: 0, lastBatchMs: 0, longestBatchMs: 0, lastError: null, writeFailure: null };

  async function flushOnce(): Promise<void> {
    if (refused === null && queue.length === 0 && Date.now() - lastHeartbeatMs < 5000) return;
    if (refused === null) {
      lastStamp = Math.max(Date.now(), lastStamp + 1);
      refused = { items: queue, stamp: lastStamp };
      queue = [];
    }
    const { items: batch, stamp } = refused;
    const started = performance.now();
    const cycles = batch.reduce((count, item) => count + (item.kind === 'cycle' ? 1 : 0), 0);
    const transfers = batch.reduce((count, item) => count + (item.kind === 'transfer' ? 1 : 0), 0);
    try {
      await writeNow(writeBatch(sessionId, batch, seq, stamp));
      refused = null;
      seq.cycle += cycles;
      seq.transfer += transfers;
      lastHeartbeatMs = Date.now();
      stats.batches += 1;
      stats.cyclesWritten += cycles;
      stats.lastError = null;
      stats.writeFailure = null;
    } catch (error) {
      // Rolled back (or cut off at COMMIT): the same batch, same stamp, is tried again on the next tick.
      stats.lastError = error instanceof Error ? error.message : String(error);
      const fault = options.faultOf?.(error) ?? null;
      if (fault) stats.writeFailure = { kind: fault.kind, message: `${options.location ?? 'logbook'}: ${fault.message}` };
    }
    stats.lastBatchMs = performance.now() - started;
    stats.longestBatchMs = Math.max(stats.longestBatchMs, stats.lastBatchMs);
  }

  /** One batch at a time: a tick while a batch is on its way waits for it. */
  function flushNow(): Promise<void> {
    if (!inFlight) inFlight = flushOnce().finally(() => (inFlight = null));
    return inFlight;
  }

  const timer = setInterval(() => void flushNow(), flushIntervalMs);
  timer.unref();

  const enqueue = (item: QueueItem): void => {
    if (closed) throw new Error(`session ${sessionId} is closed: nothing more can be added`);
    if (item.kind === 'cycle' && queue.length + (refused?.items.length ?? 0) >= maxQueuedItems) {
      stats.cyclesDropped += 1;
      return;
    }
    queue.push(item);
  };

  /** Writes everything queued now: a refused batch first, then the rest (a batch at a time). */
  async function flushAll(): Promise<void> {
    if (inFlight) await inFlight;
    do {
      await flushNow();
      if (stats.lastError !== null) throw new Error(`logbook write failed: ${stats.lastError}`);
    } while (refused !== null || queue.length > 0);
  }

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
    stats: () => ({ ...stats, queued: queue.length + (refused?.items.length ?? 0) }),
    flush: flushAll,
    async close(status: Exclude<SessionStatus, 'open'> = 'closed', signOff?: SessionSignOff, closeOptions: { note?: string } = {}) {
      if (closed) return options.readRow(sessionId);
      if (signOff && status !== 'closed') throw new Error(`a sign-off ends a session as closed, not ${status}`);
      closing = true;
      // A storage fault (disk full...) ends the flushing: what the store refused stays unwritten.
      const flushUnlessFaulted = async (): Promise<void> => {
        if (stats.writeFailure !== null) return;
        await flushAll().catch((error: unknown) => {
          if (stats.writeFailure === null) throw error;
        });
      };
      await flushUnlessFaulted();
      closed = true;
      clearInterval(timer);
      // Anything added while the last batch was on its way.
      await flushUnlessFaulted();
      if (stats.writeFailure !== null) {
        // The reserve gives back the room to end the session with why.
        queue = [];
        refused = null;
        options.reserve?.release();
      }
      try {
        // The sign-off and the end in one write, the sign-off first: a finished session is never changed after.
        await writeNow(endSession(sessionId, status, signOff ?? null, closeOptions.note ?? null));
      } catch (error) {
        const fault = options.faultOf?.(error) ?? null;
        if (!fault) throw error;
        throw new InputError(`${fault.message}; session ${sessionId} could not be ended and will show as interrupted when the logbook is next opened with room to write`, options.location);
      } finally {
        options.reserve?.release();
      }
      return options.readRow(sessionId);
    },
  };
}
