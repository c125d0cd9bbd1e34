// The Logbook screen's drift call: the unit's readings across sessions plus the trend warnings of the drift
// forecast (least-squares trend with its standard error against the design's tolerance, main/record/recall.ts).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createDesignCatalog } from '../../../main/session/designCatalog';
import { createRecallHandlers } from '../../../main/session/recallHandlers';
import type { Logbook } from '../../../main/store/logbookTypes';
import { openSqliteLogbook } from '../../../main/store/sqliteLogbook';
import { chargerDesign, cycleReading, recordedStepsJson, tempFolder, type TempFolder } from '../store/storeFixtures';

let folder: TempFolder;
let logbook: Logbook;
const day = (n: number) => new Date(Date.UTC(2026, 0, 5, 9) + n * 86_400_000);

async function session(serial: string, startedAt: Date, peakV: number): Promise<void> {
  const writer = await logbook.startSession({ unitSerial: serial, design: chargerDesign(), operator: 'bench 3', startedAt });
  for (let index = 0; index < 5; index++) writer.addCycle(cycleReading(index * 0.02, { rampPeakV: peakV, alphaDeg: 90 }));
  writer.setStepsJson(recordedStepsJson({ rampPeakV: peakV }));
  await writer.close();
}

beforeAll(async () => {
  folder = tempFolder('rampwright-drift-');
  logbook = await openSqliteLogbook(folder.file('logbook.sqlite'));
  // Our scenario: unit RW-0600's ramp peak climbs 0.6 mV a day; unit RW-0601 holds steady at its 7.3 V target.
  for (let index = 0; index < 6; index++) await session('RW-0600', day(index * 30), 7.3 + 0.0006 * index * 30);
  for (let index = 0; index < 6; index++) await session('RW-0601', day(index * 30), 7.3 + (index % 2 ? 0.001 : -0.001));
});

afterAll(async () => {
  await logbook.close();
  folder.remove();
});

describe('drift call', () => {
  it('warns when a trend will cross the tolerance, and stays quiet for a steady unit', async () => {
    const designs = createDesignCatalog({ logbook, exampleFolders: [], saveFolder: null });
    const handlers = createRecallHandlers({ logbook, designs, exporters: [] });
    const climbing = await handlers.drift({ unitSerial: 'RW-0600' });
    expect(climbing.points).toHaveLength(6);
    // The design's upper limit is 7.3 V + 3 % = 7.519 V; at 0.6 mV/day from 7.3 V it is reached 365 days after the
    // first session, 215 days after the last: inside the one-year horizon, so the ramp peak warns.
    expect(climbing.warnings.some((warning) => /^Ramp peak: .*7\.519/.test(warning))).toBe(true);
    const steady = await handlers.drift({ unitSerial: 'RW-0601' });
    expect(steady.warnings).toEqual([]);
  });
});
