/**
 * A session's commissioning record from the logbook: identity, readings judged against the design version the
 * session used, the fold of its last stored capture, the transfer curve with its fit, trims, link health, and
 * the capture digest (app/record/recordModel.ts says exactly what is hashed).
 */
import { judgeReadings } from '../../app/bench/judge';
import { parseStoredDesign } from '../store/storedContent';
import { recordedPartName } from '../../app/board/partNames';
import { InputError } from '../../app/errors';
import { parseStepReports } from '../../app/contract';
import { captureDigestText, orderCapturesForDigest, readingRowsFromChecks, readingRowsFromSteps, type CommissioningRecord } from '../../app/record/recordModel';
import type { Logbook } from '../store/logbookTypes';
import { rawCaptureBytes, sha256Hex } from '../store/captureCodec';
import { foldCapture } from './foldCapture';

export interface RecordSources {
  logbook: Logbook;
}

export async function buildRecord(sources: RecordSources, sessionId: number, options: { now?: Date; foldCycles?: number } = {}): Promise<CommissioningRecord> {
  const detail = await sources.logbook.session(sessionId);
  if (!detail) throw new InputError(`there is no session ${sessionId} in this logbook`, sources.logbook.location);
  const version = await sources.logbook.designVersion(detail.designId);
  const design = parseStoredDesign(version.designJson, `${sources.logbook.location}: session ${sessionId}`);
  // The record stands for every cycle the session stored, though it prints their cached totals: the cycles are read
  // through (one row kept) so that damaged pages under them stop the record with the logbook's damage message.
  await sources.logbook.cycleReadings(sessionId, { maxRows: 1 });
  const ordered = orderCapturesForDigest(detail.captures);
  const last = ordered[ordered.length - 1];
  const stored = last ? await sources.logbook.readCapture(last.id) : null;
  const checks = detail.readings ? judgeReadings(detail.readings, design) : [];
  const recorded = parseStepReports(detail.stepsJson);
  return {
    generatedAt: (options.now ?? new Date()).toISOString(),
    unit: { serial: detail.row.unit },
    design: { name: version.name, version: version.version, contentHash: version.contentHash },
    session: {
      id: detail.row.id, operator: detail.row.operator, status: detail.row.status, outcome: detail.row.outcome, signOffReason: detail.row.signOffReason, signOffExceptions: detail.row.signOffExceptions,
      startedAt: detail.row.startedAt, endedAt: detail.row.endedAt, notes: detail.notes, cycles: detail.row.cycles,
    },
    checks,
    readings: recorded && recorded.length > 0 ? { source: 'recorded', rows: readingRowsFromSteps(recorded) } : { source: 'judged', rows: readingRowsFromChecks(checks) },
    fold: stored ? foldCapture(stored.block, { cycles: options.foldCycles }) : [],
    transfer: { label: `session ${sessionId}`, points: detail.transfer.points, fit: detail.transfer.fit, maxDeviationDeg: detail.transfer.fit?.maxDeviationDeg ?? null },
    trims: detail.trims.map(({ part, fromOhm, toOhm, method, reason, at }) => ({ part, name: recordedPartName(design, part), fromOhm, toOhm, method, reason, at })),
    partMeasurements: detail.partMeasurements.map(({ part, value, designValue, at }) => ({ part, name: recordedPartName(design, part), value, designValue, at })),
    link: { errors: detail.row.linkErrors, silentS: detail.row.linkSilentS, events: detail.linkEvents.map(({ kind, detail: text, count, at }) => ({ kind, detail: text, count, at })) },
    captures: detail.captures.map((capture) => ({ label: capture.label, startedAt: capture.startedAt, startS: capture.startS, seconds: capture.seconds, sampleRateHz: capture.sampleRateHz, roles: capture.roles, sha256: capture.sha256 })),
    capturesSha256: detail.captures.length === 0 ? null : sha256Hex(new TextEncoder().encode(captureDigestText(detail.captures))),
  };
}

/**
 * The digest recomputed from the samples themselves: every capture is read (inflated and checked against its
 * stored hash by the store), its raw bytes hashed again, and the digest text hashed. Null without captures.
 */
export async function recomputeCaptureDigest(logbook: Logbook, sessionId: number): Promise<string | null> {
  const detail = await logbook.session(sessionId);
  if (!detail) throw new InputError(`there is no session ${sessionId} in this logbook`, logbook.location);
  if (detail.captures.length === 0) return null;
  const hashed = [];
  for (const info of detail.captures) {
    const stored = await logbook.readCapture(info.id);
    if (!stored) throw new InputError(`capture ${info.id} disappeared while it was being checked`, logbook.location);
    hashed.push({ startedAt: info.startedAt, startS: info.startS, sha256: sha256Hex(rawCaptureBytes(stored.block)) });
  }
  return sha256Hex(new TextEncoder().encode(captureDigestText(hashed)));
}
