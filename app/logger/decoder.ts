/**
 * The pure, incremental decoder of the logger protocol: lines in, sample blocks and link events out. Every line
 * stands alone (framed and CRC-checked), so the decoder resynchronises at the next line after any damage, and it
 * never throws on what arrives: bad input is counted in `health()` and reported as a `problem` event.
 */
import type { SampleBlock, TimedEdge } from '../capture/samples';
import { base64Length, decodeBase64Into } from './base64';
import { parseHex32, unframeLine, withoutCarriageReturn } from './frame';
import { alignToFrame } from './scanSkew';
import { parseGreetingBody, sameGreeting } from './greeting';
import { parseEdgesBody, parseReplyBody, parseStatusBody } from './encode';
import { emptyLinkHealth, type LinkHealth, type LinkProblem, type LinkProblemCode } from './health';
import { bytesPerBlock, defaultMaxLineChars, sequenceModulus, type LoggerEdge, type LoggerGreeting, type LoggerReply, type LoggerStatus } from './protocol';

export type DecodedEvent =
  | { kind: 'greeting'; greeting: LoggerGreeting }
  /** `samplesLost` is per channel, counted from the sequence gap just before this block (0 when none or unknown). */
  | { kind: 'block'; block: SampleBlock; sequence: number; samplesLost: number }
  | { kind: 'status'; status: LoggerStatus; newOverruns: number }
  | { kind: 'reply'; reply: LoggerReply }
  | { kind: 'problem'; problem: LinkProblem };

export interface LoggerDecoderOptions {
  /** Lines longer than this (characters, terminator excluded) are dropped and counted. Default 4096. */
  maxLineChars?: number;
  /** Time of the first block's first sample (s). Default 0. */
  timeOriginS?: number;
}

export interface LoggerDecoder {
  /** One line as parser-readline delivers it (LF removed; a trailing CR is tolerated). */
  pushLine(line: string): DecodedEvent[];
  /** Raw text as it comes off the port, split into lines here (with the same length cap). */
  pushText(text: string): DecodedEvent[];
  health(): LinkHealth;
  /** The greeting in force, once one has arrived. */
  greeting(): LoggerGreeting | null;
}

interface Stretch {
  startS: number;
  firstSequence: number;
  /** Unwrapped sequence of the last block delivered. */
  lastSequence: number;
}

const frameTags = 'HDSAET';
/** Timed edges held for the next data line; a logger that sends edges but no data cannot grow memory past this. */
const maxPendingEdges = 4096;
const tickModulus = 2 ** 32;

export function createLoggerDecoder(options: LoggerDecoderOptions = {}): LoggerDecoder {
  const maxLineChars = options.maxLineChars ?? defaultMaxLineChars;
  const health = emptyLinkHealth();
  let current: LoggerGreeting | null = null;
  let stretch: Stretch | null = null;
  /** Raw (wrapped) sequence of the last block delivered, kept across greetings to tell `identify` from a restart. */
  let lastRawSequence = -1;
  let nextStartS = options.timeOriginS ?? 0;
  let checkContinuation = false;
  let waitingReported = false;
  let lastOverruns = 0;
  let lastEdgesLost = 0;
  let pendingEdges: LoggerEdge[] = [];
  /** Each channel's last value in the block before, for putting a skewed channel back on the frame instants. */
  let previousLastV: Array<number | null> = [];
  let bytes = new Uint8Array(0);
  let partial = '';
  let discardingOversize = false;

  function problem(events: DecodedEvent[], code: LinkProblemCode, message: string): void {
    const entry: LinkProblem = { code, message, lineNumber: health.lines };
    health.lastProblem = entry;
    events.push({ kind: 'problem', problem: entry });
  }

  function expectedDataLineLength(greeting: LoggerGreeting): number {
    return 2 + 8 + 1 + base64Length(bytesPerBlock(greeting)) + 9;
  }

  function onGreeting(body: string, events: DecodedEvent[]): void {
    const parsed = parseGreetingBody(body);
    if (!parsed.ok) {
      if (parsed.unknownVersion !== null) {
        health.unknownVersions++;
        current = null;
        stretch = null;
        problem(events, 'unknown-version', `${parsed.reason}; its data is ignored until it greets with version 1`);
      } else {
        health.badGreetings++;
        problem(events, 'bad-greeting', `${parsed.reason}; the logger's data cannot be read without a valid greeting`);
      }
      return;
    }
    const greeting = parsed.greeting;
    waitingReported = false;
    // Edges sent before a greeting belong to the run before it (the logger sends them ahead of their data line).
    pendingEdges = [];
    if (current && stretch && sameGreeting(current, greeting)) {
      // An `identify` answer mid-stream, or a restart after `start`: the next block tells which.
      checkContinuation = true;
    } else {
      stretch = null;
    }
    current = greeting;
    events.push({ kind: 'greeting', greeting });
  }

  function onData(line: string, bodyEnd: number, events: DecodedEvent[]): void {
    if (!current) {
      health.dataBeforeGreeting++;
      // Reported once per wait, not 250 times a second; the count keeps growing in health().
      if (!waitingReported) {
        waitingReported = true;
        problem(events, 'data-before-greeting', 'data arrived before the logger said which channels and scales it sends (or in a protocol version Rampwright cannot read); it is skipped until a valid greeting (send identify)');
      }
      return;
    }
    const greeting = current;
    const byteCount = bytesPerBlock(greeting);
    const sequence = line.charCodeAt(10) === 32 ? parseHex32(line, 2) : -1;
    if (bytes.length < byteCount) bytes = new Uint8Array(byteCount);
    if (sequence < 0 || !decodeBase64Into(line, 11, bodyEnd, byteCount, bytes)) {
      health.badDataLines++;
      problem(
        events,
        'bad-data',
        `a data line does not hold ${greeting.channels.length} channels x ${greeting.blockSamples} samples as the greeting announced; it is skipped`,
      );
      return;
    }
    let afterGap = false;
    let samplesLost = 0;
    const blockS = greeting.blockSamples / greeting.sampleRateHz;
    if (stretch !== null && lastRawSequence >= 0) {
      const delta = (sequence - lastRawSequence + sequenceModulus) % sequenceModulus;
      const restarted = delta === 0 || delta >= sequenceModulus / 2 || (checkContinuation && delta !== 1);
      if (restarted && delta === 0 && !checkContinuation) {
        health.duplicateBlocks++;
        problem(events, 'duplicate', `data line ${hex(sequence)} arrived twice; the copy is dropped`);
        return;
      }
      if (restarted) {
        if (!checkContinuation) {
          health.sequenceRestarts++;
          problem(events, 'sequence-restart', `the logger's block count went from ${hex(lastRawSequence)} back to ${hex(sequence)} (it restarted); analysis restarts its cycle tracking`);
        }
        stretch = null;
      } else if (delta > 1) {
        const blocksLost = delta - 1;
        samplesLost = blocksLost * greeting.blockSamples;
        afterGap = true;
        health.sequenceGaps++;
        health.blocksLost += blocksLost;
        health.samplesLost += samplesLost;
        problem(
          events,
          'sequence-gap',
          `${blocksLost} data line${blocksLost === 1 ? '' : 's'} lost between ${hex(lastRawSequence)} and ${hex(sequence)} ` +
            `(${samplesLost} samples per channel, ${(1000 * blocksLost * blockS).toFixed(1)} ms); analysis restarts its cycle tracking`,
        );
      }
      if (stretch) stretch.lastSequence += delta;
    }
    checkContinuation = false;
    if (stretch === null) {
      afterGap = health.blocks > 0;
      stretch = { startS: nextStartS, firstSequence: 0, lastSequence: 0 };
    }
    lastRawSequence = sequence;
    const startS = stretch.startS + (stretch.lastSequence - stretch.firstSequence) * blockS;
    nextStartS = startS + blockS;
    const block = toSampleBlock(greeting, bytes, startS, afterGap, afterGap ? [] : previousLastV);
    previousLastV = lastSampleVolts(greeting, bytes);
    if (pendingEdges.length > 0 && greeting.edgeTiming) {
      block.edges = placeEdges(pendingEdges, greeting.edgeTiming.clockHz, sequence, blockS, startS);
      pendingEdges = [];
    }
    events.push({ kind: 'block', block, sequence, samplesLost });
    health.blocks++;
    health.samples += greeting.blockSamples;
  }

  function onStatus(body: string, events: DecodedEvent[]): void {
    const status = parseStatusBody(body);
    if (!status) {
      health.garbageLines++;
      problem(events, 'garbage', 'a status line from the logger could not be read; skipped');
      return;
    }
    // Overruns are cumulative since `start`, so a lost status line loses no count; a smaller value means a restart.
    const newOverruns = status.overruns >= lastOverruns ? status.overruns - lastOverruns : status.overruns;
    lastOverruns = status.overruns;
    if (status.edgesLost !== undefined) {
      const newEdgesLost = status.edgesLost >= lastEdgesLost ? status.edgesLost - lastEdgesLost : status.edgesLost;
      lastEdgesLost = status.edgesLost;
      if (newEdgesLost > 0) {
        health.loggerEdgesLost += newEdgesLost;
        problem(events, 'logger-edges-lost', `the logger dropped ${newEdgesLost} timed edge${newEdgesLost === 1 ? '' : 's'} (its edge queue was full: a pulse train or a noisy edge input); those cycles are read from the samples`);
      }
    }
    if (newOverruns > 0) {
      health.loggerOverruns += newOverruns;
      problem(events, 'logger-overrun', `the logger discarded ${newOverruns} block${newOverruns === 1 ? '' : 's'} it could not send in time (its buffer overflowed: lower the rate or use another USB port)`);
    }
    events.push({ kind: 'status', status, newOverruns });
  }

  function onEdges(body: string, events: DecodedEvent[]): void {
    const edges = parseEdgesBody(body);
    if (!edges || !current?.edgeTiming) {
      health.badEdgeLines++;
      problem(events, 'bad-edges', edges ? 'an edge line came from a logger whose greeting announced no timed edges; skipped' : 'an edge line from the logger could not be read; skipped');
      return;
    }
    health.edges += edges.length;
    pendingEdges.push(...edges);
    if (pendingEdges.length > maxPendingEdges) pendingEdges.splice(0, pendingEdges.length - maxPendingEdges);
  }

  function onReply(body: string, events: DecodedEvent[]): void {
    const reply = parseReplyBody(body);
    if (!reply) {
      health.garbageLines++;
      problem(events, 'garbage', 'a reply from the logger could not be read; skipped');
      return;
    }
    if (!reply.ok) {
      health.loggerRefusals++;
      problem(events, 'logger-refused', `the logger refused "${reply.command}": ${reply.detail}`);
    }
    events.push({ kind: 'reply', reply });
  }

  function dispatch(line: string, bodyEnd: number, events: DecodedEvent[]): void {
    const tag = line[0];
    if (tag === 'D') onData(line, bodyEnd, events);
    else if (tag === 'H') onGreeting(line.slice(0, bodyEnd), events);
    else if (tag === 'S') onStatus(line.slice(0, bodyEnd), events);
    else if (tag === 'T') onEdges(line.slice(0, bodyEnd), events);
    else onReply(line.slice(0, bodyEnd), events);
  }

  /** Finds a whole frame glued behind garbage (bytes lost a line end before it); CRC-checked, so a false find is ~2^-32. */
  function salvage(line: string): { start: number; bodyEnd: number } | null {
    if (current) {
      const start = line.length - expectedDataLineLength(current);
      if (start > 0 && line.charCodeAt(start) === 68 && line.charCodeAt(start + 1) === 32) {
        const tail = line.slice(start);
        const frame = unframeLine(tail);
        if (frame.ok) return { start, bodyEnd: frame.bodyEnd };
      }
    }
    let tries = 0;
    for (let index = 1; index < line.length - 10 && tries < 16; index++) {
      if (line.charCodeAt(index + 1) !== 32 || !frameTags.includes(line[index]) || line[index] === 'D') continue;
      tries++;
      const frame = unframeLine(line.slice(index));
      if (frame.ok) return { start: index, bodyEnd: frame.bodyEnd };
    }
    return null;
  }

  function pushLine(rawLine: string): DecodedEvent[] {
    const events: DecodedEvent[] = [];
    health.lines++;
    const line = withoutCarriageReturn(rawLine);
    if (line.length === 0) return events;
    if (line.length > maxLineChars) {
      health.oversizeLines++;
      problem(events, 'oversize', `a line of ${line.length} characters arrived, longer than the ${maxLineChars} allowed (line ends lost or a wrong device on the port); skipped`);
      return events;
    }
    const frame = unframeLine(line);
    const looksLikeFrame = line.length > 10 && frameTags.includes(line[0]) && line.charCodeAt(1) === 32;
    if (frame.ok && looksLikeFrame) {
      dispatch(line, frame.bodyEnd, events);
      return events;
    }
    const found = salvage(line);
    if (found) {
      health.garbageLines++;
      problem(events, 'garbage', `${found.start} characters of noise before a logger line were skipped`);
      dispatch(line.slice(found.start), found.bodyEnd, events);
      return events;
    }
    if (looksLikeFrame && !frame.ok && frame.reason === 'crc') {
      health.crcFailures++;
      const what = line[0] === 'D' ? 'a data line' : 'a logger line';
      problem(events, 'crc', `${what} failed its CRC check (bytes changed or lost on the USB link); it is discarded`);
    } else {
      health.garbageLines++;
      problem(events, 'garbage', 'a line that is not from a Rampwright logger was skipped (noise, another device, or a wrong baud rate)');
    }
    return events;
  }

  function pushText(text: string): DecodedEvent[] {
    const events: DecodedEvent[] = [];
    let start = 0;
    while (start <= text.length) {
      const newline = text.indexOf('\n', start);
      const piece = text.slice(start, newline < 0 ? text.length : newline);
      if (newline < 0) {
        if (!discardingOversize) partial += piece;
        if (partial.length > maxLineChars + 1) {
          // Report once and drop the rest up to the next line end so memory stays bounded.
          events.push(...pushLine(partial));
          partial = '';
          discardingOversize = true;
        }
        break;
      }
      if (discardingOversize) {
        discardingOversize = false;
      } else {
        events.push(...pushLine(partial + piece));
      }
      partial = '';
      start = newline + 1;
    }
    return events;
  }

  return { pushLine, pushText, health: () => ({ ...health }), greeting: () => current };
}

function hex(sequence: number): string {
  return sequence.toString(16).toUpperCase().padStart(8, '0');
}

/**
 * Edge ticks count from the first sample of the run (sequence 0), so the run's sample 0 is at `startS - sequence x
 * blockS` on the blocks' time axis. Ticks wrap at 2^32; each is unwrapped to the turn nearest this block's start
 * (edge lines travel just ahead of their data line, so an edge is never far from it).
 */
function placeEdges(edges: readonly LoggerEdge[], clockHz: number, sequence: number, blockS: number, startS: number): TimedEdge[] {
  const runStartS = startS - sequence * blockS;
  const blockTicks = sequence * blockS * clockHz;
  return edges.map((edge) => {
    const turns = Math.round((blockTicks - edge.ticks) / tickModulus);
    return { role: edge.role, direction: edge.direction, timeS: runStartS + (edge.ticks + turns * tickModulus) / clockHz };
  });
}

/** Each channel's last sample in volts, as sampled (before any skew alignment). */
function lastSampleVolts(greeting: LoggerGreeting, bytes: Uint8Array): number[] {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const lastFrame = (greeting.blockSamples - 1) * greeting.channels.length * 2;
  return greeting.channels.map((scale, channel) => scale.offsetV + scale.gainV * view.getInt16(lastFrame + channel * 2, true));
}

/** Rows of volts per role; channels sampled after the frame's instant (greeting skew=) are moved onto it. */
function toSampleBlock(greeting: LoggerGreeting, bytes: Uint8Array, startS: number, afterGap: boolean, previousLastV: ReadonlyArray<number | null>): SampleBlock {
  const samples = greeting.blockSamples;
  const channelCount = greeting.channels.length;
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const block: SampleBlock = {
    startS,
    sampleRateHz: greeting.sampleRateHz,
    sync: new Float64Array(0),
    ramp: new Float64Array(0),
    gate: new Float64Array(0),
    control: null,
    afterGap,
  };
  for (let channel = 0; channel < channelCount; channel++) {
    const scale = greeting.channels[channel];
    if (scale.role === 'unused') continue;
    const volts = new Float64Array(samples);
    for (let sample = 0, at = channel * 2; sample < samples; sample++, at += channelCount * 2) {
      volts[sample] = scale.offsetV + scale.gainV * view.getInt16(at, true);
    }
    if (greeting.scanSkew) alignToFrame(volts, greeting.scanSkew[channel], previousLastV[channel] ?? null);
    block[scale.role] = volts;
  }
  return block;
}
