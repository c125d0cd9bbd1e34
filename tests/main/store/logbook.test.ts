/**
 * The logbook contract: the same suite on a bench's SQLite file and on a shared PostgreSQL logbook (a real server
 * started for this file, tests/helpers/logbookStores.ts). Both stores run the same query programs; these tests hold
 * them to the same answers, each checked by hand or against an outside reference.
 */
import { execFileSync } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { SampleBlock } from '../../../app/capture/samples';
import { InputError } from '../../../app/errors';
import type { Logbook } from '../../../main/store/logbookTypes';
import { openLogbook } from '../../../main/store/openLogbook';
import { startStoreKit, storeKinds, type StoreKit } from '../../helpers/logbookStores';
import { chargerDesign, cycleReading, recordedStepsJson, tempFolder, type TempFolder } from './storeFixtures';

describe.each(storeKinds)('%s logbook', (kind) => {
  let kit: StoreKit;
  let folder: TempFolder;
  let location: string;
  let logbook: Logbook;
  beforeAll(async () => {
    kit = await startStoreKit(kind);
  });
  afterAll(async () => {
    await kit.stop();
  });
  beforeEach(async () => {
    folder = tempFolder();
    location = await kit.freshLocation();
    logbook = await openLogbook(location);
  });
  afterEach(async () => {
    await logbook.close();
    folder.remove();
  });

  const day = (n: number): Date => new Date(Date.UTC(2026, 2, 1 + n, 9, 0, 0));

  /**
   * A closed session of unit `serial` on day `n` with the given ramp peaks and transfer points; its ramp step
   * recorded the last peak (the settled board), unless `recorded` says otherwise or is null (no steps kept).
   */
  async function session(serial: string, n: number, peaks: number[], transfer: Array<[number, number]> = [], design = chargerDesign(), recorded: { rampPeakV?: number } | null = {}): Promise<number> {
    const writer = await logbook.startSession({ unitSerial: serial, design, operator: 'bench 2', startedAt: day(n) });
    peaks.forEach((peak, index) => writer.addCycle(cycleReading(index * 0.02, { rampPeakV: peak, alphaDeg: 80 + index })));
    transfer.forEach(([controlV, alphaDeg], index) => writer.addTransferPoint({ t: index, controlV, alphaDeg }));
    if (recorded !== null) writer.setStepsJson(recordedStepsJson({ rampPeakV: recorded.rampPeakV ?? peaks[peaks.length - 1] }));
    const row = await writer.close();
    return row.id;
  }

  describe('board designs', () => {
    it('versions a design by its content: same content in another key order is the same version, a change makes the next', async () => {
      const design = chargerDesign();
      const first = await logbook.saveDesign(design);
      const reordered = Object.fromEntries(Object.entries(design).reverse()) as typeof design;
      expect(Object.keys(reordered)[0]).not.toBe(Object.keys(design)[0]);
      expect(await logbook.saveDesign(reordered)).toEqual(first);
      const changed = await logbook.saveDesign({ ...design, rampTargetV: 7.5 });
      expect([first.version, changed.version]).toEqual([1, 2]);
      expect(changed.contentHash).not.toBe(first.contentHash);
      // A session references the exact version it used, even after a later revision exists.
      const id = await session('RW-0142', 0, [7.3], [], design);
      const detail = await logbook.session(id);
      expect(detail?.row.designVersion).toBe(1);
      expect(detail?.designId).toBe(first.id);
    });
  });

  describe('recall', () => {
    it('lists sessions by unit, by board design and by date range', async () => {
      const other = { ...chargerDesign(), name: 'Heater board HT-60F (demo)', mainsHz: 60 };
      const a = await session('RW-0142', 0, [7.3]);
      const b = await session('RW-0142', 10, [7.2]);
      const c = await session('RW-0207', 5, [7.4], [], other);
      expect((await logbook.listSessions({ unitSerial: 'RW-0142' })).map((row) => row.id)).toEqual([a, b]);
      expect((await logbook.listSessions({ designName: other.name })).map((row) => row.id)).toEqual([c]);
      expect((await logbook.listSessions({ from: '2026-03-03', to: '2026-03-11T09:00:00Z' })).map((row) => row.id)).toEqual([c]);
      expect((await logbook.listSessions()).map((row) => row.id)).toEqual([a, c, b]);
      await expect(logbook.listSessions({ from: 'last tuesday' })).rejects.toThrow(InputError);
      const units = await logbook.listUnits();
      expect(units.map((unit) => [unit.serial, unit.sessions, unit.lastSessionAt])).toEqual([
        ['RW-0142', 2, day(10).toISOString()],
        ['RW-0207', 1, day(5).toISOString()],
      ]);
    });

    it("summarises a session: cycles, mean alpha, median ramp peak (even count: mean of the middle two), link errors", async () => {
      const writer = await logbook.startSession({ unitSerial: 'RW-0311', design: chargerDesign(), operator: 'bench 1', startedAt: day(1) });
      // Peaks 7.0 7.4 7.1 7.3: sorted 7.0 7.1 7.3 7.4, median (7.1 + 7.3) / 2 = 7.2 (by hand). Alpha 80..83: mean 81.5.
      [7.0, 7.4, 7.1, 7.3].forEach((peak, index) => writer.addCycle(cycleReading(index * 0.02, { rampPeakV: peak, alphaDeg: 80 + index })));
      writer.addLinkEvent('crc-failures', 'CRC mismatch on 3 lines', 3);
      writer.addLinkEvent('reopened', '/dev/ttyACM0');
      writer.addLinkEvent('unplugged', '/dev/ttyACM0');
      await writer.flush();
      // While open, the figures are counted live.
      const [open] = await logbook.listSessions({ unitSerial: 'RW-0311' });
      expect(open.status).toBe('open');
      expect(open.cycles).toBe(4);
      const row = await writer.close();
      expect(row.status).toBe('closed');
      expect(row.cycles).toBe(4);
      // Over the whole session (no step recorded): the median peak and the mean alpha, kept apart from the figures
      // as recorded, which this session (no steps, no stored readings) does not have.
      expect(row.wholeSession.alphaMeanDeg).toBeCloseTo(81.5, 12);
      expect(row.wholeSession.rampPeakMedianV).toBeCloseTo(7.2, 12);
      expect(row).toMatchObject({ rampPeakV: null, alphaMinDeg: null, alphaMaxDeg: null });
      // 3 CRC failures + 1 unplug; a reopen is not an error.
      expect(row.linkErrors).toBe(4);
      expect(row.endedAt).not.toBeNull();
    });

    it("gives a session's transfer curve and its least-squares fit", async () => {
      // alpha = 150 - 20 controlV exactly, plus one point 1 deg off: fit by hand from the normal equations.
      // Points (1,130) (2,110) (3,90) (4,71): n 4, sx 10, sy 401, sxx 30, sxy 130 + 220 + 270 + 284 = 904.
      const points: Array<[number, number]> = [[1, 130], [2, 110], [3, 90], [4, 71]];
      const id = await session('RW-0142', 0, [7.3], points);
      const detail = await logbook.session(id);
      expect(detail?.transfer.points.map((point) => [point.controlV, point.alphaDeg])).toEqual(points);
      // gain = (4*904 - 10*401) / 20 = (3616 - 4010) / 20 = -19.7; offset = (401 - (-19.7)(10)) / 4 = 149.5.
      expect(detail?.transfer.fit?.gainDegPerV).toBeCloseTo(-19.7, 9);
      expect(detail?.transfer.fit?.offsetDeg).toBeCloseTo(149.5, 9);
      // Residuals: 130-129.8=0.2, 110-110.1=-0.1, 90-90.4=-0.4, 71-70.7=0.3: max |deviation| 0.4.
      expect(detail?.transfer.fit?.maxDeviationDeg).toBeCloseTo(0.4, 9);
      expect([detail?.transfer.fit?.controlMinV, detail?.transfer.fit?.controlMaxV]).toEqual([1, 4]);
    });

    it("gives a session's per-cycle readings in order, thinned evenly for drawing", async () => {
      const peaks = Array.from({ length: 10 }, (_, index) => 7 + index / 100);
      const id = await session('RW-0142', 0, peaks);
      const all = await logbook.cycleReadings(id);
      expect(all.map((row) => row.rampPeakV)).toEqual(peaks);
      expect(all.map((row) => row.t)).toEqual(peaks.map((_, index) => index * 0.02));
      // 10 cycles into at most 4 rows: every third cycle (seq 0, 3, 6, 9), in order.
      const thinned = await logbook.cycleReadings(id, { maxRows: 4 });
      expect(thinned.map((row) => row.alphaDeg)).toEqual([80, 83, 86, 89]);
      expect(await logbook.cycleReadings(id + 1000)).toEqual([]);
    });

    it('puts two sessions of a unit side by side and flags differences beyond the design tolerance', async () => {
      const a = await session('RW-0142', 0, [7.3, 7.3, 7.3]);
      // Ramp peak tolerance: 3 % of 7.3 V = 0.219 V (fixture design). 7.6 - 7.3 = 0.3 V is beyond; alpha means equal.
      const b = await session('RW-0142', 30, [7.6, 7.6, 7.6]);
      const comparison = await logbook.compareSessions(a, b);
      const peak = comparison.rows.find((row) => row.key === 'rampPeakV');
      expect(peak?.difference).toBeCloseTo(0.3, 12);
      expect(peak?.beyondTolerance).toBe(true);
      expect(peak).toMatchObject({ scope: 'recorded', judged: true });
      // Whole-session figures are shown apart and never judged; a count never is.
      const alpha = comparison.rows.find((row) => row.key === 'wholeSession.alphaMeanDeg');
      expect(alpha).toMatchObject({ scope: 'whole-session', judged: false, beyondTolerance: false });
      expect(alpha?.difference).toBeCloseTo(0, 12);
      expect(comparison.rows.find((row) => row.key === 'cycles')).toMatchObject({ a: 3, b: 3, judged: false, beyondTolerance: false });
      expect(comparison.rows.find((row) => row.key === 'wholeSession.alphaSpreadDeg')?.label).toMatch(/spread.*not jitter/);
      await expect(logbook.compareSessions(a, 999)).rejects.toThrow(/no session 999/);
    });

    it('a unit trimmed from a high ramp: its figures are as recorded after the trim, the whole session apart', async () => {
      // Before the trim the ramp peaked at 10.4 V for 5 cycles, after it 7.3 V for 3; the ramp step was recorded
      // again after the trim (our scenario). The whole-session median is the 10.4 V of the early cycles.
      const id = await session('RW-0420', 0, [10.4, 10.4, 10.4, 10.4, 10.4, 7.3, 7.3, 7.3], [], chargerDesign(), { rampPeakV: 7.31 });
      const [row] = await logbook.listSessions({ unitSerial: 'RW-0420' });
      expect(row.rampPeakV).toBe(7.31);
      expect(row.wholeSession.rampPeakMedianV).toBe(10.4);
      expect(await logbook.sessionFigures(id)).toMatchObject({ rampPeakV: 7.31, wholeSession: { rampPeakMedianV: 10.4 } });
    });

    it('keeps how a session ended: a sign-off, plain or with its reason and exceptions, with the session\'s end', async () => {
      const plain = await logbook.startSession({ unitSerial: 'RW-0430', design: chargerDesign(), operator: 'bench 2', startedAt: day(1) });
      expect(await plain.close('closed', { kind: 'signed-off' })).toMatchObject({ status: 'closed', outcome: 'signed-off', signOffReason: null, signOffExceptions: [] });
      const excepted = await logbook.startSession({ unitSerial: 'RW-0431', design: chargerDesign(), operator: 'bench 2', startedAt: day(2) });
      const exceptions = [{ step: 'transfer' as const, problem: 'not-recorded' as const, readings: [] }];
      expect(await excepted.close('closed', { kind: 'signed-off-with-exceptions', reason: 'transfer curve on the customer cabinet', exceptions })).toMatchObject({
        outcome: 'signed-off-with-exceptions', signOffReason: 'transfer curve on the customer cabinet', signOffExceptions: exceptions,
      });
      const abandoned = await logbook.startSession({ unitSerial: 'RW-0432', design: chargerDesign(), operator: 'bench 2', startedAt: day(3) });
      expect(await abandoned.close()).toMatchObject({ status: 'closed', outcome: 'closed' });
      // The signed session's archive carries it, so its content (and hash) says how it ended.
      const archived = await logbook.archiveSession((await logbook.listSessions({ unitSerial: 'RW-0431' }))[0].id);
      expect(archived.session.record).toMatchObject({ signOff: 'signed-off-with-exceptions', signOffReason: 'transfer curve on the customer cabinet', signOffExceptionsJson: JSON.stringify(exceptions) });
    });

    it('trends ramp peak and alpha gain across a unit’s sessions (hand-computed least squares)', async () => {
      // Ramp peaks 7.30, 7.31, 7.33 V on days 0, 10, 20: mean day 10, mean peak 7.3133...;
      // Sxx = 100 + 0 + 100 = 200; Sxy = (-10)(-0.013333) + 0 + (10)(0.016667) = 0.3; slope 0.0015 V/day.
      // Residuals from 7.29833 + 0.0015 d: +0.001667, -0.003333, +0.001667; SSR = 1.6667e-5; SE = sqrt(SSR / 1 / 200) = 2.8868e-4.
      // Alpha gains -20, -19, -18.5 deg/V (two exact transfer points each): slope = (-10*-0.8333 + 10*0.6667)/200 = 0.075 deg/V/day.
      const gainPoints = (gain: number): Array<[number, number]> => [[1, 150 + gain], [5, 150 + 5 * gain]];
      await session('RW-0142', 0, [7.3], gainPoints(-20));
      await session('RW-0142', 10, [7.31], gainPoints(-19));
      await session('RW-0142', 20, [7.33], gainPoints(-18.5));
      await session('RW-0207', 15, [9.9]);
      const drift = await logbook.unitDrift('RW-0142');
      expect(drift.points.map((point) => point.rampPeakV)).toEqual([7.3, 7.31, 7.33]);
      expect(drift.rampPeakV?.perDay).toBeCloseTo(0.0015, 12);
      expect(drift.rampPeakV?.perDayStandardError).toBeCloseTo(2.8868e-4, 7);
      expect(drift.rampPeakV?.sessions).toBe(3);
      expect(drift.points.map((point) => point.alphaGainDegPerV)).toEqual([-20, -19, -18.5].map((g) => expect.closeTo(g, 9)));
      expect(drift.alphaGainDegPerV?.perDay).toBeCloseTo(0.075, 9);
      await expect(logbook.unitDrift('RW-9999')).rejects.toThrow(/no unit "RW-9999"/);
    });
  });

  describe('captures', () => {
    function block(): SampleBlock {
      const n = 500;
      const make = (f: (i: number) => number) => Float64Array.from({ length: n }, (_, i) => f(i));
      return {
        startS: 1.25,
        sampleRateHz: 25_000,
        sync: make((i) => 10 * Math.sin((2 * Math.PI * 50 * i) / 25_000)),
        ramp: make((i) => (i % 250) * 0.0292),
        gate: make((i) => (i % 250 > 120 && i % 250 < 128 ? 12 : 0.02)),
        control: make(() => 3.3),
        afterGap: true,
      };
    }

    it('stores a stretch of samples compressed and gives back every sample bit for bit, with its hash', async () => {
      const writer = await logbook.startSession({ unitSerial: 'RW-0142', design: chargerDesign(), operator: 'bench 1' });
      const original = block();
      writer.addCapture(original, 'ramp check');
      await writer.close();
      const [info] = (await logbook.session(writer.sessionId))?.captures ?? [];
      expect(info.roles).toEqual(['sync', 'ramp', 'gate', 'control']);
      expect(info.seconds).toBeCloseTo(500 / 25_000, 12);
      const stored = await logbook.readCapture(info.id);
      expect(stored?.block.startS).toBe(1.25);
      expect(stored?.block.afterGap).toBe(true);
      expect(Array.from(stored?.block.ramp ?? [])).toEqual(Array.from(original.ramp));
      expect(Array.from(stored?.block.control ?? [])).toEqual(Array.from(original.control ?? []));

      // Outside check of the stored format with Python's zlib and hashlib (and numpy): the blob inflates to
      // little-endian float64, channel after channel, and its sha-256 is the one recorded.
      const [blob] = await kit.raw<{ data: Buffer }>(location, 'SELECT data FROM captures WHERE id = ?', [info.id]);
      writeFileSync(folder.file('blob.bin'), blob.data);
      const script = [
        'import sys, zlib, hashlib, numpy',
        'raw = zlib.decompress(open(sys.argv[1], "rb").read())',
        'x = numpy.frombuffer(raw, dtype="<f8").reshape(4, -1)',
        'print(hashlib.sha256(raw).hexdigest(), x.shape[1], repr(float(x[1][249])), repr(float(x[0][125])))',
      ].join('\n');
      const [sha, samples, ramp249, sync125] = execFileSync('/usr/bin/python3', ['-c', script, folder.file('blob.bin')], { encoding: 'utf8' }).trim().split(' ');
      expect(sha).toBe(info.sha256);
      expect(Number(samples)).toBe(500);
      expect(Number(ramp249)).toBe(original.ramp[249]);
      expect(Number(sync125)).toBe(original.sync[125]);
    });

    it('refuses a stored capture whose samples no longer match their hash', async () => {
      const writer = await logbook.startSession({ unitSerial: 'RW-0142', design: chargerDesign(), operator: 'bench 1' });
      writer.addCapture(block());
      await writer.close();
      const { deflateSync } = await import('node:zlib');
      await kit.raw(location, 'UPDATE captures SET data = ?', [deflateSync(Buffer.alloc(500 * 4 * 8, 1))]);
      const [info] = (await logbook.session(writer.sessionId))?.captures ?? [];
      await expect(logbook.readCapture(info.id)).rejects.toThrow(/does not match its sha-256/);
    });
  });
});
