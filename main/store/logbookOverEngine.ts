/**
 * The Logbook, written once over a store engine: the engine runs query programs (sqlProgram.ts) as reads or as
 * one write transaction, and opens session writers; everything the logbook answers is computed by the shared
 * programs, so the SQLite logbook on a bench and the PostgreSQL one a line shares give the same answers.
 */
import { hostname } from 'node:os';
import { boardDesignSchema } from '../../app/board/design';
import { InputError } from '../../app/errors';
import { benchName } from './benchName';
import { archiveContentHash } from './canonicalJson';
import { importArchive, readArchiveSession } from './exchangeRows';
import type { Logbook, LogbookWriter, SessionRow } from './logbookTypes';
import { compareSessions, unitDrift } from './recallQueries';
import { latestDesignVersion, latestSessionPerUnit, readDesignVersion } from './recordQueries';
import { recoverInterruptedSessions } from './sessionRecovery';
import { cycleReadings, listSessions, listUnits, readCapture, readSessionRow, sessionDetail, transferCurve } from './sessionQueries';
import { sessionFigures } from './sessionSummary';
import type { SqlProgram } from './sqlProgram';
import { insertSession, recordSharedCopy, saveDesign, sessionsToShare } from './writeQueries';

export interface SessionWriterOptions {
  flushIntervalMs?: number;
  /** Beyond this many queued items (the store refuses writes) new cycles are dropped and counted. Default 500 000. */
  maxQueuedItems?: number;
  /** Where `close()` gets the finished session's row. */
  readRow: (sessionId: number) => Promise<SessionRow>;
  /** The logbook's file or address, for messages. */
  location?: string;
}

export interface LogbookEngine {
  /** The file or address (never with a password). */
  readonly location: string;
  read<T>(program: SqlProgram<T>): Promise<T>;
  /** Runs the program in one write transaction: all of it or nothing. */
  write<T>(program: SqlProgram<T>): Promise<T>;
  openWriter(sessionId: number, options: SessionWriterOptions): LogbookWriter;
  close(): Promise<void>;
}

/** Who is writing a session: recovery checks this process (same host) or the heartbeat (another host). */
export function writerIdentityNow(): { host: string; pid: number } {
  return { host: hostname(), pid: process.pid };
}

export function createLogbookOverEngine(engine: LogbookEngine): Logbook {
  const { location } = engine;
  const readRow = (id: number) => engine.read(readSessionRow(id, location));
  return {
    location,
    async saveDesign(design) {
      return engine.write(saveDesign(boardDesignSchema.parse(design), Date.now()));
    },
    designVersion: (designId) => engine.read(readDesignVersion(designId)),
    latestDesignVersion: (designName) => engine.read(latestDesignVersion(designName)),
    latestSessionPerUnit: (designName) => engine.read(latestSessionPerUnit(designName)),
    listUnits: () => engine.read(listUnits()),
    async startSession(request, writerOptions = {}) {
      const serial = request.unitSerial.trim();
      if (serial === '') throw new InputError('a unit needs a serial number', 'unit');
      const design = await engine.write(saveDesign(boardDesignSchema.parse(request.design), Date.now()));
      const sessionId = await engine.write(insertSession({
        serial, designId: design.id, designName: design.name, operator: request.operator, startedAtMs: (request.startedAt ?? new Date()).getTime(),
        notes: request.notes ?? null, bench: request.bench ?? benchName(), writer: writerIdentityNow(), nowMs: Date.now(),
      }));
      return engine.openWriter(sessionId, { ...writerOptions, readRow, location });
    },
    listSessions: (filter = {}) => engine.read(listSessions(filter)),
    session: (id) => engine.read(sessionDetail(id, location)),
    transferCurve: (sessionId) => engine.read(transferCurve(sessionId)),
    cycleReadings: (sessionId, options = {}) => engine.read(cycleReadings(sessionId, options.maxRows)),
    readCapture: (captureId) => engine.read(readCapture(captureId, location)),
    sessionFigures: (sessionId) => engine.read(sessionFigures(sessionId)),
    compareSessions: (aId, bId) => engine.read(compareSessions(aId, bId, location)),
    unitDrift: (unitSerial) => engine.read(unitDrift(unitSerial, location)),
    recoverInterruptedSessions: () => engine.write(recoverInterruptedSessions()),
    archiveSession: (sessionId) => engine.read(readArchiveSession(sessionId)),
    async sessionContentHash(sessionId) {
      return archiveContentHash((await engine.read(readArchiveSession(sessionId))).session);
    },
    importArchiveSession: (request) => engine.write(importArchive(request)),
    sessionsToShare: (target) => engine.read(sessionsToShare(target)),
    recordSharedCopy: (copy) => engine.write(recordSharedCopy(copy, Date.now())),
    close: () => engine.close(),
  };
}
