/**
 * `rampwright sim` end to end: options checked at the edge, a capture file through writeCaptureFile, and the
 * protocol streamed in real time to a file and to a real pseudo-terminal pair made by socat (Debian package).
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { constants, existsSync, mkdtempSync, openSync, readFileSync, rmSync, writeFileSync, writeSync, closeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ReadStream } from 'node:tty';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { boardDesignSchema } from '../../../app/board/design';
import { predictRamp } from '../../../app/board/rampModel';
import { createLoggerDecoder, type DecodedEvent } from '../../../app/logger/decoder';
import { encodeCommand } from '../../../app/logger/encode';
import { runCli as run } from './cliRun';

let folder = '';
let designPath = '';
const designJson = {
  name: 'Wren HW-50 test board',
  mainsHz: 50,
  rectifier: 'half-wave',
  supplyV: 15,
  rampTargetV: 5.5,
  alphaMaxDeg: 165,
  parts: { rEmitter: { ohm: 7500 }, rBiasTop: { ohm: 22000 }, rBiasBottom: { ohm: 100000 }, cRamp: { farad: 4.7e-7 } },
};

function decodeText(text: string): { events: DecodedEvent[]; decoder: ReturnType<typeof createLoggerDecoder> } {
  const decoder = createLoggerDecoder();
  return { events: decoder.pushText(text), decoder };
}

beforeAll(() => {
  folder = mkdtempSync(join(tmpdir(), 'rampwright-sim-'));
  designPath = join(folder, 'wren.board.json');
  writeFileSync(designPath, JSON.stringify(designJson));
});

afterAll(() => rmSync(folder, { recursive: true, force: true }));

describe('rampwright sim, checked options', () => {
  it.each([
    [['--fault', 'blown-fuse', '--out', 'x.csv'], /--fault: unknown fault "blown-fuse"/],
    [['--out', 'x.csv', '--rate', 'fast'], /--rate: must be samples per second per channel from 1000 to 200000/],
    [['--out', 'x.csv', '--control-sweep', '1-9'], /--control-sweep: must be FROM:TO in volts/],
    [['--out', 'x.csv', '--control', '3', '--control-sweep', '1:9'], /either --control or --control-sweep/],
    [[], /give --link <device path> to stream the logger protocol, or --out <capture file>/],
    [['--link', '/nonexistent/rw-logger'], /\/nonexistent\/rw-logger: no such device or file; start the pseudo-terminal pair first/],
  ])('%j is refused with exit 2 and a message naming the problem', async (extra, message) => {
    const result = await run(['sim', '--design', designPath, ...extra]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(message);
  });

  it('names the design file when it is missing or not JSON', async () => {
    const missing = await run(['sim', '--design', join(folder, 'none.board.json'), '--out', join(folder, 'x.csv')]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toMatch(/none\.board\.json: no such board design file/);
    const broken = join(folder, 'broken.board.json');
    writeFileSync(broken, '{ "name": "half a file", ');
    const bad = await run(['sim', '--design', broken, '--out', join(folder, 'x.csv')]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/broken\.board\.json: not valid JSON/);
  });
});

describe('rampwright sim --out', () => {
  it('writes a CSV capture with the fault visible in the ramp', async () => {
    const out = join(folder, 'wren-wrong-re.csv');
    const result = await run(['sim', '--design', designPath, '--out', out, '--seconds', '0.2', '--rate', '20000', '--fault', 'wrong-emitter-resistor', '--bits', '16', '--noise', '0']);
    expect(result.code).toBe(0);
    expect(result.stdout).toMatch(/wrote 4000 samples/);
    const rows = readFileSync(out, 'utf8').trim().split('\n');
    expect(rows[0]).toBe('t,sync,ramp,gate,control');
    expect(rows).toHaveLength(4001); // 0.2 s x 20 000 samples/s, plus the header
    const rampPeakV = Math.max(...rows.slice(1).map((row) => Number(row.split(',')[2])));
    // The model's peak for the 1.5 x emitter resistor; the last sample lands up to one sample before the end.
    const fitted = predictRamp(boardDesignSchema.parse(designJson), { partOverrides: { rEmitter: 7500 * 1.5 } });
    expect(Math.abs(rampPeakV - fitted.peakV)).toBeLessThan(fitted.slopeVPerS / 20_000 + 0.001);
  });
});

describe('rampwright sim --link', () => {
  it('streams the protocol to a plain file at real time: greeting then exactly the blocks of the asked seconds', async () => {
    const path = join(folder, 'link.txt');
    writeFileSync(path, '');
    const result = await run(['sim', '--design', designPath, '--link', path, '--seconds', '0.3']);
    expect(result.code).toBe(0);
    const { events, decoder } = decodeText(readFileSync(path, 'latin1'));
    expect(events[0].kind).toBe('greeting');
    // 0.3 s / (120 samples / 25 000 samples/s) = 62.5: 62 whole blocks.
    expect(events.filter((event) => event.kind === 'block')).toHaveLength(62);
    expect(decoder.health().crcFailures + decoder.health().sequenceGaps + decoder.health().garbageLines).toBe(0);
  });

  const socatAvailable = spawnSync('socat', ['-V'], { stdio: 'ignore' }).status === 0;
  describe.skipIf(!socatAvailable)('on a socat pseudo-terminal pair', () => {
    let socat: ChildProcess | null = null;
    let loggerEnd = '';
    let hostEnd = '';

    beforeAll(async () => {
      loggerEnd = join(folder, 'rw-logger');
      hostEnd = join(folder, 'rw-host');
      socat = spawn('socat', [`pty,raw,echo=0,link=${loggerEnd}`, `pty,raw,echo=0,link=${hostEnd}`], { stdio: 'ignore' });
      for (let wait = 0; wait < 100 && !(existsSync(loggerEnd) && existsSync(hostEnd)); wait++) await new Promise((resolve) => setTimeout(resolve, 50));
    });

    afterAll(() => {
      socat?.kill();
    });

    it('answers identify read back from the same path, and every block arrives intact', async () => {
      const input = new ReadStream(openSync(hostEnd, constants.O_RDONLY | constants.O_NOCTTY));
      const commandFd = openSync(hostEnd, constants.O_WRONLY | constants.O_NOCTTY);
      let text = '';
      input.on('data', (chunk: Buffer) => (text += chunk.toString('latin1')));
      const timer = setTimeout(() => writeSync(commandFd, `${encodeCommand({ command: 'identify' })}\n`), 300);
      const result = await run(['sim', '--design', designPath, '--link', loggerEnd, '--seconds', '1']);
      await new Promise((resolve) => setTimeout(resolve, 300));
      clearTimeout(timer);
      input.destroy();
      closeSync(commandFd);
      expect(result.code).toBe(0);
      expect(result.stderr).toMatch(/1 commands answered/);
      const { events, decoder } = decodeText(text);
      const replies = events.flatMap((event) => (event.kind === 'reply' ? [event.reply] : []));
      expect(replies).toContainEqual({ ok: true, command: 'identify', detail: '' });
      const blocks = events.filter((event) => event.kind === 'block');
      // 1 s = 208 whole blocks of 4.8 ms; the reader keeps up, so none is lost on the way (and none is corrupted).
      expect(blocks.length + decoder.health().blocksLost).toBe(208);
      expect(decoder.health().crcFailures + decoder.health().garbageLines).toBe(0);
    });

    it('unplug-after: the logger goes silent at the given second and the command ends', async () => {
      const input = new ReadStream(openSync(hostEnd, constants.O_RDONLY | constants.O_NOCTTY));
      let text = '';
      input.on('data', (chunk: Buffer) => (text += chunk.toString('latin1')));
      const result = await run(['sim', '--design', designPath, '--link', loggerEnd, '--seconds', '5', '--fault', 'unplug-after=0.4']);
      await new Promise((resolve) => setTimeout(resolve, 300));
      input.destroy();
      expect(result.code).toBe(0);
      expect(result.stderr).toMatch(/went silent \(unplug-after fault\) after 0\.4/);
      const blocks = decodeText(text).events.flatMap((event) => (event.kind === 'block' ? [event.block] : []));
      expect(blocks.length).toBeGreaterThan(0);
      // The last block starts before 0.4 s (83 blocks of 4.8 ms end at 0.3984 s).
      expect(blocks.at(-1)!.startS).toBeLessThan(0.4);
    });
  });
});
