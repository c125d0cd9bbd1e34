// The fleet call of the bench contract over a logbook of our own invented units: the same histograms as the
// fleet report (main/record/recall.ts), the unit placed in them, and refusals that name what is wrong.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BenchCallError, type BenchClient } from '../../../app/contract';
import type { BenchContext } from '../../../main/session/benchContext';
import { openRecordSources } from '../../../main/record/openRecordSources';
import { fleetReport } from '../../../main/record/recall';
import { chargerDesign, cycleReading, recordedStepsJson, tempFolder, type TempFolder } from '../store/storeFixtures';
import { openTestBench } from './benchClientKit';

let folder: TempFolder;
let context: BenchContext;
let client: BenchClient;
const design = chargerDesign();

beforeAll(async () => {
  folder = tempFolder('rampwright-fleet-');
  const sources = await openRecordSources(folder.file('logbook.sqlite'), { create: true });
  // Eight units, one session each: ramp peaks 7.16 to 7.44 V, alpha gains 22 to 24.1 deg/V; bench 5 did the first
  // five, bench 6 the last three.
  for (let unit = 0; unit < 8; unit++) {
    const writer = await sources.logbook.startSession({ unitSerial: `FL-${unit}`, design, operator: 'A. Fitter', bench: unit < 5 ? 'bench 5' : 'bench 6', startedAt: new Date(Date.UTC(2026, 2, 1 + unit)) });
    const peakV = 7.16 + 0.04 * unit;
    for (let index = 0; index < 4; index++) writer.addCycle(cycleReading(index * 0.02, { rampPeakV: peakV, slopeVPerMs: peakV / 9.7, alphaDeg: 90 }));
    writer.setStepsJson(recordedStepsJson({ rampPeakV: peakV, slopeVPerMs: peakV / 9.7 }));
    for (let index = 0; index <= 6; index++) writer.addTransferPoint({ t: index, controlV: 2 + index * 0.5, alphaDeg: 3 + (22 + 0.3 * unit) * (2 + index * 0.5) });
    await writer.close();
  }
  await sources.close();
  ({ context, client } = await openTestBench(folder.file('logbook.sqlite')));
}, 60_000);

afterAll(async () => {
  await context.close();
  folder.remove();
});

describe('fleet of a board design over the contract', () => {
  it('gives the fleet report\'s histograms and places the chosen unit in them', async () => {
    const view = await client.fleet({ designName: design.name, unitSerial: 'FL-6' });
    expect(view.units).toBe(8);
    const sources = await openRecordSources(folder.file('logbook.sqlite'));
    const report = await fleetReport(sources, design.name, { unitSerial: 'FL-6', runs: 500 });
    await sources.close();
    for (const figure of view.figures) {
      const same = report.figures.find((candidate) => candidate.key === figure.key)!;
      expect(figure.bins).toEqual(same.bins);
      expect(figure.prediction).toEqual(same.prediction);
      expect(figure.count).toBe(8);
      expect(figure.bins.reduce((sum, bin) => sum + bin.count, 0)).toBe(8);
    }
    const peak = view.figures.find((figure) => figure.key === 'rampPeakV')!;
    // FL-6: 7.40 V, above six of the eight units (7.16 ... 7.36 V).
    expect(peak.marked).toMatchObject({ serial: 'FL-6', fleetFractionBelow: 6 / 8 });
    expect(peak.marked!.value).toBeCloseTo(7.4, 6);
    const gain = view.figures.find((figure) => figure.key === 'alphaGainDegPerV')!;
    expect(gain.marked!.value).toBeCloseTo(22 + 0.3 * 6, 6);
  });

  it('splits the fleet by the bench that did each unit (means by hand)', async () => {
    const view = await client.fleet({ designName: design.name });
    expect(view.benches.map((bench) => [bench.bench, bench.units])).toEqual([['bench 5', 5], ['bench 6', 3]]);
    // bench 5: peaks 7.16, 7.20, 7.24, 7.28, 7.32 V (mean 7.24), gains 22.0 ... 23.2 deg/V (mean 22.6);
    // bench 6: peaks 7.36, 7.40, 7.44 V (mean 7.40), gains 23.5, 23.8, 24.1 deg/V (mean 23.8).
    expect(view.benches[0].rampPeakMeanV).toBeCloseTo(7.24, 6);
    expect(view.benches[0].alphaGainMeanDegPerV).toBeCloseTo(22.6, 6);
    expect(view.benches[1].rampPeakMeanV).toBeCloseTo(7.4, 6);
    expect(view.benches[1].alphaGainMeanDegPerV).toBeCloseTo(23.8, 6);
  });

  it('refuses a design or unit the logbook does not hold, naming it', async () => {
    const noDesign = await client.fleet({ designName: 'No such board' }).then(() => null, (caught: unknown) => caught);
    expect(noDesign).toBeInstanceOf(BenchCallError);
    expect((noDesign as BenchCallError).message).toContain('there is no board design "No such board"');
    const noUnit = await client.fleet({ designName: design.name, unitSerial: 'FL-99' }).then(() => null, (caught: unknown) => caught);
    expect((noUnit as BenchCallError).message).toContain('unit "FL-99" has no session');
    const unmarked = await client.fleet({ designName: design.name });
    expect(unmarked.figures.every((figure) => figure.marked === null)).toBe(true);
  });
});
