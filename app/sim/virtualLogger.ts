/**
 * The virtual logger: the virtual board behind the logger protocol. It produces protocol lines (greeting, data,
 * status, replies) for a stretch of signal time, answers host commands, and applies the link faults. Pure: the
 * caller decides how lines travel (a pseudo-terminal, a file, an in-process link) and at what pace.
 */
import type { BoardDesign } from '../board/design';
import { encodeBlock, encodeGreeting, encodeReply, encodeStatus, parseCommand } from '../logger/encode';
import { protocolVersion, type LoggerGreeting } from '../logger/protocol';
import { InputError } from '../errors';
import { voltsToCode } from './channelScales';
import { type FaultName, type LinkFaultName, linkFaultNames } from './faults';
import { createSeededRandom } from './random';
import { createVirtualBoard, type VirtualBoard, type VirtualBoardOptions } from './virtualBoard';

export interface VirtualLoggerOptions extends VirtualBoardOptions {
  loggerId?: string;
  /** Samples per channel per data line. Default 120 (PROTOCOL.md, link budget). */
  blockSamples?: number;
  /** Seconds of signal before `unplug-after` silences the logger. */
  unplugAfterS?: number;
  /** Send data from power-up without waiting for `start` (default true). */
  autostart?: boolean;
}

export interface VirtualLogger {
  greeting(): LoggerGreeting;
  /** Every line due up to signal time `timeS` (s since power-up), in order, without terminators. */
  linesUntil(timeS: number): string[];
  /**
   * Advances to `timeS` without sending, as a logger whose output buffer is full: the blocks are discarded and
   * counted as overruns (the next status line reports them, the sequence numbers show the gap).
   */
  skipUntil(timeS: number): void;
  /** Answers one host command line (terminator removed); the answer is also queued ahead of the next data. */
  handleCommandLine(line: string): string[];
  /** Signal time produced so far (s). */
  timeS(): number;
  isStarted(): boolean;
  isUnplugged(): boolean;
  readonly board: VirtualBoard;
}

/** Chances per data line of the link faults (our scenario values). */
export const linkFaultChances = { drop: 0.02, corrupt: 0.02, garbage: 0.02, overrun: 0.01 };
export const virtualRateLimitsHz = { min: 1000, max: 200_000 };
const base64Alphabet = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';

export function createVirtualLogger(design: BoardDesign, options: VirtualLoggerOptions = {}): VirtualLogger {
  const faults: readonly FaultName[] = options.faults ?? [];
  const link = new Set(faults.filter((fault): fault is LinkFaultName => (linkFaultNames as readonly string[]).includes(fault)));
  const unplugAfterS = options.unplugAfterS ?? null;
  if (link.has('unplug-after') && unplugAfterS === null) throw new InputError('unplug-after needs its seconds (unplug-after=SECONDS)', '--fault');
  const blockSamples = options.blockSamples ?? 120;
  if (!Number.isInteger(blockSamples) || blockSamples < 1 || blockSamples > 382) {
    throw new InputError(`block must be 1-382 samples per channel so a line stays under 4096 characters (got ${blockSamples})`, 'blockSamples');
  }
  const loggerId = options.loggerId ?? 'VIRTUAL-1';
  const random = createSeededRandom((options.seed ?? 1) + 0x5bd1e995);
  let board = createVirtualBoard(design, options);
  let boardOffsetS = 0;
  let started = options.autostart ?? true;
  let unplugged = false;
  let sequence = 0;
  let overruns = 0;
  let nextStatusS = 1;
  const pending: string[] = [encodeGreeting(greetingOf(board))];

  function greetingOf(current: VirtualBoard): LoggerGreeting {
    return {
      version: protocolVersion,
      loggerId,
      sampleRateHz: current.sampleRateHz,
      adcBits: options.adcBits ?? 12,
      blockSamples,
      channels: current.channels.map(({ role, gainV, offsetV }) => ({ role, gainV, offsetV })),
    };
  }

  function timeS(): number {
    return boardOffsetS + board.timeS();
  }

  function garbageText(): string {
    const length = 3 + Math.floor(random.next() * 60);
    let text = '';
    for (let index = 0; index < length; index++) text += String.fromCharCode(32 + Math.floor(random.next() * 95));
    return text;
  }

  function dataLine(): string[] {
    const block = board.nextBlock(blockSamples);
    const channels = board.channels;
    const codes = new Int16Array(blockSamples * channels.length);
    const signals = [block.sync, block.ramp, block.gate, block.control ?? block.sync];
    for (let sample = 0; sample < blockSamples; sample++) {
      for (let channel = 0; channel < channels.length; channel++) {
        codes[sample * channels.length + channel] = voltsToCode(channels[channel], signals[channel][sample]);
      }
    }
    const thisSequence = sequence++;
    if (!started) return [];
    if (link.has('logger-overrun') && random.next() < linkFaultChances.overrun) {
      overruns++;
      return [];
    }
    if (link.has('drop-blocks') && random.next() < linkFaultChances.drop) return [];
    let line = encodeBlock({ sequence: thisSequence, codes });
    if (link.has('corrupt-blocks') && random.next() < linkFaultChances.corrupt) {
      const at = 11 + Math.floor(random.next() * (line.length - 20));
      const replacement = base64Alphabet[(base64Alphabet.indexOf(line[at]) + 1 + Math.floor(random.next() * 62)) % 64];
      line = line.slice(0, at) + replacement + line.slice(at + 1);
    }
    if (link.has('garbage') && random.next() < linkFaultChances.garbage) {
      return random.next() < 0.5 ? [garbageText(), line] : [garbageText() + line];
    }
    return [line];
  }

  function linesUntil(untilS: number): string[] {
    const lines = unplugged ? [] : pending.splice(0);
    const blockS = blockSamples / board.sampleRateHz;
    while (!unplugged && timeS() + blockS <= untilS + 1e-12) {
      if (unplugAfterS !== null && link.has('unplug-after') && timeS() >= unplugAfterS) {
        unplugged = true;
        break;
      }
      lines.push(...dataLine());
      if (started && timeS() >= nextStatusS) {
        lines.push(encodeStatus({ nextSequence: sequence, overruns }));
        nextStatusS += 1;
      }
    }
    return lines;
  }

  function skipUntil(untilS: number): void {
    const blockS = blockSamples / board.sampleRateHz;
    while (!unplugged && timeS() + blockS <= untilS + 1e-12) {
      board.nextBlock(blockSamples);
      sequence++;
      if (started) overruns++;
    }
  }

  function restartSampling(sampleRateHz: number): void {
    const nowS = timeS();
    const mainsHz = options.mainsHzOverride ?? design.mainsHz;
    const startPhaseDeg = (((options.startPhaseDeg ?? 30) + 360 * mainsHz * nowS) % 360 + 360) % 360;
    board = createVirtualBoard(design, { ...options, sampleRateHz, startPhaseDeg });
    boardOffsetS = nowS;
  }

  function handleCommandLine(line: string): string[] {
    if (unplugged) return [];
    const parsed = parseCommand(line);
    const answer: string[] = [];
    if (!parsed.ok) {
      answer.push(encodeReply(parsed.reply));
    } else {
      const command = parsed.command;
      if (command.command === 'start') {
        started = true;
        sequence = 0;
        overruns = 0;
        nextStatusS = timeS() + 1;
        answer.push(encodeReply({ ok: true, command: 'start', detail: '' }), encodeGreeting(greetingOf(board)));
      } else if (command.command === 'stop') {
        started = false;
        answer.push(encodeReply({ ok: true, command: 'stop', detail: '' }));
      } else if (command.command === 'identify') {
        answer.push(encodeReply({ ok: true, command: 'identify', detail: '' }), encodeGreeting(greetingOf(board)));
      } else if (command.command === 'edges') {
        answer.push(encodeReply({ ok: false, command: 'edges', detail: 'this logger has no timed edge inputs' }));
      } else if (command.sampleRateHz < virtualRateLimitsHz.min || command.sampleRateHz > virtualRateLimitsHz.max) {
        answer.push(encodeReply({ ok: false, command: 'rate', detail: `rate ${command.sampleRateHz} Hz is outside this logger's ${virtualRateLimitsHz.min}-${virtualRateLimitsHz.max} Hz` }));
      } else {
        restartSampling(command.sampleRateHz);
        sequence = 0;
        answer.push(encodeReply({ ok: true, command: 'rate', detail: String(command.sampleRateHz) }), encodeGreeting(greetingOf(board)));
      }
    }
    pending.push(...answer);
    return answer;
  }

  return {
    greeting: () => greetingOf(board),
    linesUntil,
    skipUntil,
    handleCommandLine,
    timeS,
    isStarted: () => started,
    isUnplugged: () => unplugged,
    get board() {
      return board;
    },
  };
}

/** Every line a virtual logger sends from power-up over `durationS` of signal. */
export function virtualLoggerLines(design: BoardDesign, options: VirtualLoggerOptions & { durationS: number }): string[] {
  return createVirtualLogger(design, options).linesUntil(options.durationS);
}
