/**
 * What happened on the link to the logger during a session, written to the session as link events and counted
 * once, so the progress line, the final summary and the logbook give the same number of errors (they did not:
 * 5 on the progress line, 3 in the summary). Errors are the rows of `linkErrorKinds`; a silent logger is
 * measured as time (`link-silent` rows, their length in ms), not counted as watchdog errors; and joining a logger
 * that was already streaming (the first line cut by the port opening, data before its greeting) is no error.
 */
import type { LinkProblem } from '../../app/logger';
import type { LinkEvent } from '../serial/loggerLink';
import { isLinkErrorKind, linkEventKindOfProblem, type LinkEventKind, type LogbookWriter } from '../store/logbookTypes';

/**
 * A gap in the data longer than this is silence. A logger sends a data line every few milliseconds (PROTOCOL.md);
 * 2 s rides out a recorder held up by a busy computer and matches the bench screen's "stalled" (our rule).
 */
export const silenceThresholdMs = 2000;

export interface LinkSummary {
  /** Sum of the counts of error rows written so far (the session's `linkErrors` once they are stored). */
  errors: number;
  /** Seconds without data, the stretch still running included. */
  silentS: number;
  /** Stretches of silence, the running one included. */
  silentStretches: number;
  /** Seconds of the stretch still running (0 when data flows). */
  silentNowS: number;
}

export interface LinkAccount {
  /** A link event (opened, unplugged, watchdog-timeout...): written as its row. */
  event(event: LinkEvent): void;
  /** A line arrived at `atMs`: closes a silence it ends. True when it is the first line since the port opened. */
  line(atMs: number): boolean;
  /** A decoder problem with the line it came from; counted per kind until the next `flush`. */
  problem(problem: LinkProblem, onFirstLine: boolean): void;
  /** Writes the problem counts gathered since the last flush (one row per kind: a CRC storm is one row). */
  flush(): void;
  /** Ends the account at `endMs`: flushes and writes the silence still running, if any. */
  finish(endMs: number): void;
  summary(nowMs: number): LinkSummary;
}

function linkEventRow(event: LinkEvent): { kind: LinkEventKind; detail: string; count: number } | null {
  switch (event.kind) {
    case 'opened':
    case 'closed':
      return { kind: event.kind, detail: event.path, count: 1 };
    case 'reopened':
      return { kind: 'reopened', detail: event.path, count: 1 };
    case 'unplugged':
      return { kind: 'unplugged', detail: `${event.path}: ${event.detail}`, count: 1 };
    case 'watchdog-timeout':
      return { kind: 'watchdog-timeout', detail: `${event.path}: silent for ${event.silentMs} ms, the port was given up and is looked for again`, count: 1 };
    case 'error':
      return { kind: 'link-error', detail: `${event.path}: ${event.message}`, count: 1 };
    case 'line-too-long':
      return { kind: 'line-too-long', detail: `${event.bytes} bytes, cut at ${event.keptBytes}`, count: 1 };
    case 'lines-dropped':
      return { kind: 'lines-dropped', detail: 'the recorder fell behind', count: event.count };
  }
}

const seconds = (ms: number): string => `${(ms / 1000).toFixed(1)} s`;

export function createLinkAccount(writer: Pick<LogbookWriter, 'addLinkEvent'>, startedMs: number): LinkAccount {
  let errors = 0;
  let silentMs = 0;
  let silentStretches = 0;
  let lastDataMs = startedMs;
  let firstLineAfterOpen = true;
  const pending = new Map<LinkEventKind, { count: number; detail: string }>();

  const write = (kind: LinkEventKind, detail: string, count: number): void => {
    writer.addLinkEvent(kind, detail, count);
    if (isLinkErrorKind(kind)) errors += count;
  };
  const writeSilence = (fromMs: number, toMs: number): void => {
    const lengthMs = Math.round(toMs - fromMs);
    silentMs += lengthMs;
    silentStretches += 1;
    write('link-silent', `no data from the logger for ${seconds(lengthMs)} (${seconds(fromMs - startedMs)} to ${seconds(toMs - startedMs)} into the session)`, lengthMs);
  };

  return {
    event(event) {
      const row = linkEventRow(event);
      if (row) write(row.kind, row.detail, row.count);
      if (event.kind === 'opened' || event.kind === 'reopened') firstLineAfterOpen = true;
    },
    line(atMs) {
      if (atMs - lastDataMs > silenceThresholdMs) writeSilence(lastDataMs, atMs);
      lastDataMs = Math.max(lastDataMs, atMs);
      const first = firstLineAfterOpen;
      firstLineAfterOpen = false;
      return first;
    },
    problem(problem, onFirstLine) {
      // The port opened in the middle of a line: that line's beginning was never ours to receive.
      const kind = onFirstLine && problem.code === 'garbage' ? 'partial-line-at-open' : (linkEventKindOfProblem[problem.code] ?? 'decoder-problem');
      const entry = pending.get(kind) ?? { count: 0, detail: `${problem.code}: ${problem.message}` };
      entry.count += 1;
      pending.set(kind, entry);
    },
    flush() {
      for (const [kind, { count, detail }] of pending) write(kind, detail, count);
      pending.clear();
    },
    finish(endMs) {
      this.flush();
      if (endMs - lastDataMs > silenceThresholdMs) writeSilence(lastDataMs, endMs);
      lastDataMs = Math.max(lastDataMs, endMs);
    },
    summary(nowMs) {
      const runningMs = nowMs - lastDataMs > silenceThresholdMs ? nowMs - lastDataMs : 0;
      return { errors, silentS: (silentMs + runningMs) / 1000, silentStretches: silentStretches + (runningMs > 0 ? 1 : 0), silentNowS: runningMs / 1000 };
    },
  };
}
