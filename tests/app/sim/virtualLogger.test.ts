import { describe, expect, it } from 'vitest';
import { createLoggerDecoder, type DecodedEvent } from '../../../app/logger/decoder';
import { encodeCommand } from '../../../app/logger/encode';
import { frameLine } from '../../../app/logger/frame';
import { createVirtualBoard } from '../../../app/sim/virtualBoard';
import { createVirtualLogger, virtualLoggerLines } from '../../../app/sim/virtualLogger';
import { halfWaveBoard, join } from './simFixtures';

const design = halfWaveBoard();
const base = { sampleRateHz: 25_000, seed: 5, noiseV: 0.01, blockSamples: 120 } as const;

function largestDifference(values: Float64Array, reference: Float64Array, referenceStart: number): number {
  let largest = 0;
  values.forEach((value, index) => (largest = Math.max(largest, Math.abs(value - reference[referenceStart + index]))));
  return largest;
}

function decode(lines: string[]) {
  const decoder = createLoggerDecoder();
  const events: DecodedEvent[] = lines.flatMap((line) => decoder.pushLine(line));
  const blocks = events.flatMap((event) => (event.kind === 'block' ? [event] : []));
  return { decoder, events, blocks, health: decoder.health() };
}

describe('virtual logger', () => {
  // 0.48 s = 100 blocks of 120 samples at 25 kS/s.
  const reference = join([createVirtualBoard(design, base).nextBlock(12_000)]);

  it('sends a greeting then data that decodes to exactly the virtual board signals', () => {
    const lines = virtualLoggerLines(design, { ...base, durationS: 0.48 });
    expect(lines[0]).toMatch(/^H RWLOG\/1 id=VIRTUAL-1 rate=25000 bits=12 block=120 ch=sync,ramp,gate,control /);
    const { blocks, health } = decode(lines);
    expect(blocks).toHaveLength(100);
    const decoded = join(blocks.map((event) => event.block));
    // The board's samples are already quantised to the ADC grid, so they survive the codes exactly (to rounding of offset + gain x code).
    expect(largestDifference(decoded.ramp, reference.ramp, 0)).toBeLessThan(1e-9);
    expect(largestDifference(decoded.gate, reference.gate, 0)).toBeLessThan(1e-9);
    expect(health.crcFailures + health.garbageLines + health.sequenceGaps).toBe(0);
  });

  it('sends a status line each second of signal', () => {
    const lines = virtualLoggerLines(design, { ...base, durationS: 3 });
    expect(lines.filter((line) => line.startsWith('S '))).toHaveLength(3);
    expect(decode(lines).health.loggerOverruns).toBe(0);
  });

  it('drop-blocks: the host sees gaps with the right samples lost, and what it gets is right', () => {
    const { blocks, health } = decode(virtualLoggerLines(design, { ...base, faults: ['drop-blocks'], durationS: 4.8 }));
    // 1000 blocks at a 2 % drop chance: about 20 lost, never none (0.98^1000 = 2e-9).
    expect(health.blocksLost).toBeGreaterThan(5);
    expect(blocks.length + health.blocksLost).toBe(1000);
    expect(health.samplesLost).toBe(health.blocksLost * 120);
    expect(blocks.filter((event) => event.block.afterGap)).toHaveLength(health.sequenceGaps);
  });

  it('corrupt-blocks and garbage: counted, and no block with wrong samples gets through', () => {
    const lines = virtualLoggerLines(design, { ...base, faults: ['corrupt-blocks', 'garbage'], durationS: 0.48 * 4 });
    const { blocks, health } = decode(lines);
    expect(health.crcFailures).toBeGreaterThan(0);
    expect(health.garbageLines).toBeGreaterThan(0);
    const full = join([createVirtualBoard(design, base).nextBlock(48_000)]);
    for (const event of blocks) {
      const at = event.sequence * 120;
      expect(largestDifference(event.block.sync, full.sync, at)).toBeLessThan(1e-9);
    }
    // Every block either arrived or was counted as lost (a CRC failure becomes a gap at the next good line).
    expect(blocks.length + health.blocksLost).toBeGreaterThanOrEqual(399);
  });

  it('logger-overrun: the status lines report what the sequence numbers show missing', () => {
    const { health } = decode(virtualLoggerLines(design, { ...base, faults: ['logger-overrun'], durationS: 10 }));
    expect(health.loggerOverruns).toBeGreaterThan(0);
    // Overruns after the last status line are not reported yet: at most the blocks of the last second more.
    expect(health.blocksLost).toBeGreaterThanOrEqual(health.loggerOverruns);
  });

  it('unplug-after: goes silent after the given seconds', () => {
    const logger = createVirtualLogger(design, { ...base, faults: ['unplug-after'], unplugAfterS: 0.5 });
    const { blocks } = decode(logger.linesUntil(2));
    expect(logger.isUnplugged()).toBe(true);
    const last = blocks.at(-1)!.block;
    // Last block starts before 0.5 s; 0.5 s is a whole number of 4.8 ms blocks plus part of one.
    expect(last.startS).toBeLessThan(0.5);
    expect(last.startS + 120 / 25_000).toBeGreaterThanOrEqual(0.5);
    expect(logger.linesUntil(3)).toEqual([]);
    expect(logger.handleCommandLine(encodeCommand({ command: 'identify' }))).toEqual([]);
  });

  it('answers start, stop, rate and identify as PROTOCOL.md says', () => {
    const logger = createVirtualLogger(design, { ...base, autostart: false });
    const first = decode(logger.linesUntil(0.1));
    expect(first.blocks).toHaveLength(0);
    expect(first.events[0].kind).toBe('greeting');

    expect(logger.handleCommandLine(encodeCommand({ command: 'start' }))[0]).toMatch(/^A start\*/);
    const decoder = createLoggerDecoder();
    const afterStart = logger.linesUntil(0.2).flatMap((line) => decoder.pushLine(line));
    expect(afterStart.map((event) => event.kind).slice(0, 3)).toEqual(['reply', 'greeting', 'block']);
    expect(afterStart.find((event) => event.kind === 'block')?.kind === 'block' && afterStart.find((event) => event.kind === 'block')).toMatchObject({ sequence: 0 });

    logger.handleCommandLine(encodeCommand({ command: 'stop' }));
    const stopped = logger.linesUntil(0.3).flatMap((line) => decoder.pushLine(line));
    expect(stopped.filter((event) => event.kind === 'block')).toHaveLength(0);

    logger.handleCommandLine(encodeCommand({ command: 'rate', sampleRateHz: 10_000 }));
    logger.handleCommandLine(encodeCommand({ command: 'start' }));
    const restarted = logger.linesUntil(0.5).flatMap((line) => decoder.pushLine(line));
    const blocks = restarted.flatMap((event) => (event.kind === 'block' ? [event] : []));
    expect(blocks[0].block.sampleRateHz).toBe(10_000);
    expect(blocks[0].block.afterGap).toBe(true);
    expect(blocks.slice(1).every((event) => !event.block.afterGap)).toBe(true);

    expect(logger.handleCommandLine(encodeCommand({ command: 'rate', sampleRateHz: 5 }))[0]).toMatch(/^E rate rate 5 Hz is outside/);
    expect(logger.handleCommandLine(frameLine('reboot'))[0]).toMatch(/^E reboot unknown command/);
    expect(logger.handleCommandLine('start*00000000')[0]).toMatch(/^E \? command failed its CRC check/);
    const identify = logger.handleCommandLine(encodeCommand({ command: 'identify' }));
    expect(identify[1]).toMatch(/^H RWLOG\/1 id=VIRTUAL-1 rate=10000 /);
    expect(decoder.health().sequenceRestarts).toBe(0);
  });
});

describe('virtual logger that falls behind', () => {
  it('skipUntil discards blocks as logger overruns, reported by the next status line and seen as a gap', () => {
    const logger = createVirtualLogger(design, { ...base });
    const decoder = createLoggerDecoder();
    logger.linesUntil(0.48).forEach((line) => decoder.pushLine(line));
    logger.skipUntil(0.48 + 10 * 0.0048); // 10 blocks of 4.8 ms
    const events = logger.linesUntil(1.2).flatMap((line) => decoder.pushLine(line));
    const firstAfter = events.find((event) => event.kind === 'block');
    expect(firstAfter?.kind === 'block' && firstAfter.samplesLost).toBe(10 * 120);
    expect(decoder.health().loggerOverruns).toBe(10);
  });
});
