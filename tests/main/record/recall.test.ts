/**
 * Recall over a logbook of our own invented units: two sessions side by side, a unit's drift with its warning, and
 * the fleet of a board design against the board model's Monte Carlo prediction.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { analyseTolerances } from '../../../app/board/toleranceAnalysis';
import { designFigures } from '../../../app/record/designFigures';
import { openRecordSources, type OpenedRecordSources } from '../../../main/record/openRecordSources';
import { compareReport, driftReport, fleetReport } from '../../../main/record/recall';
import { comparisonPage, driftPage, fleetPage } from '../../../main/record/recallPages';
import { chargerDesign, cycleReading, recordedStepsJson, tempFolder, type TempFolder } from '../store/storeFixtures';

let folder: TempFolder;
let sources: OpenedRecordSources;
const sessionIds: number[] = [];
const day = (n: number) => new Date(Date.UTC(2026, 0, 5, 9) + n * 86_400_000);

/** One session: a few cycles at this ramp peak and slope, and a transfer sweep with this gain and offset. */
async function session(serial: string, startedAt: Date, peakV: number, gainDegPerV: number, offsetDeg = 2.5): Promise<number> {
  const writer = await sources.logbook.startSession({ unitSerial: serial, design: chargerDesign(), operator: 'bench 3', startedAt });
  for (let index = 0; index < 5; index++) writer.addCycle(cycleReading(index * 0.02, { rampPeakV: peakV + (index - 2) * 0.001, slopeVPerMs: peakV / 9.7, alphaDeg: 90 + (index % 2) * 0.4 }));
  for (let index = 0; index <= 8; index++) {
    const controlV = 2 + index * 0.5;
    writer.addTransferPoint({ t: index, controlV, alphaDeg: offsetDeg + gainDegPerV * controlV });
  }
  // The ramp step as recorded (the middle of the five peaks); the transfer line comes from the recorded points.
  writer.setStepsJson(recordedStepsJson({ rampPeakV: peakV, slopeVPerMs: peakV / 9.7 }));
  return (await writer.close()).id;
}

beforeAll(async () => {
  folder = tempFolder('rampwright-recall-');
  sources = await openRecordSources(folder.file('logbook.sqlite'), { create: true });
  // Unit RW-0500 drifts: its ramp peak climbs 0.6 mV a day (a capacitor losing value, our scenario).
  for (let index = 0; index < 7; index++) sessionIds.push(await session('RW-0500', day(index * 30), 7.3 + 0.0006 * index * 30 + (index % 2 ? 0.0015 : -0.0015), 24));
  // A fleet of twelve more units, one session each, spread around the design.
  for (let unit = 0; unit < 12; unit++) await session(`RW-06${String(unit).padStart(2, '0')}`, day(unit), 7.1 + 0.04 * unit, 22 + 0.3 * unit);
}, 60_000);

afterAll(async () => {
  await sources.close();
  folder.remove();
});

describe('recall', () => {
  it('two sessions side by side: ramp peak difference beyond the 3 % tolerance is flagged, transfer curves overlaid', async () => {
    const report = await compareReport(sources, sessionIds[0], sessionIds[6]);
    // 0.6 mV/day over 180 days = 108 mV, within 219 mV: not flagged; alpha gain has no tolerance in the comparison.
    expect(report.flagged).not.toContain('Ramp peak');
    const far = await compareReport(sources, sessionIds[0], (await sources.logbook.listSessions({ unitSerial: 'RW-0611' }))[0].id);
    // 7.54 V against 7.2985 V: 0.24 V apart, beyond 0.219 V.
    expect(far.flagged).toContain('Ramp peak');
    // Each session: one path of point markers (nine squares or diamonds, nine closed shapes) and its legend swatch.
    for (const colour of ['#8e4fb0', '#5b6b82']) {
      const paths = far.transferSvg.match(new RegExp(`<path d="[^"]*" fill="${colour}"`, 'g')) ?? [];
      expect(paths.length, colour).toBe(2);
      expect(Math.max(...paths.map((path) => path.split('Z').length - 1)), colour).toBe(9);
    }
    expect(far.transferSvg).toContain('stroke-dasharray="6 3"'); // the second session's fit
  });

  it('drift of a unit: the climbing ramp peak raises the warning with a date, and the plot shows the limit', async () => {
    const report = await driftReport(sources, 'RW-0500');
    const peak = report.figures.find((figure) => figure.key === 'rampPeakV')!;
    expect(peak.analysis.points.length).toBe(7);
    // Known trend 0.6 mV/day; the +-1.5 mV alternation moves the fit slope by a few percent at most.
    expect(peak.analysis.fit!.slope).toBeGreaterThan(0.00055);
    expect(peak.analysis.fit!.slope).toBeLessThan(0.00065);
    expect(peak.analysis.warning).toBe(true);
    // (7.519 - 7.3) / 0.0006 = 365 days after the first session, 185 days after the last: inside the one-year horizon.
    const forecast = peak.analysis.forecasts.find((candidate) => candidate.side === 'high')!;
    expect(forecast.status).toBe('predicted');
    expect(forecast.crossingDay!).toBeGreaterThan(340);
    expect(forecast.crossingDay!).toBeLessThan(390);
    expect(report.warnings.join('\n')).toMatch(/^Ramp peak: trend .* will cross the upper limit 7\.519/m);
    expect(peak.svg).toContain('upper limit 7.519');
    // Alpha gain did not move: no warning for it.
    expect(report.figures.find((figure) => figure.key === 'alphaGainDegPerV')!.analysis.warning).toBe(false);
  });

  it('fleet of a design: one value per unit, histogram counts add up, the Monte Carlo prediction overlaid', async () => {
    const design = chargerDesign();
    const report = await fleetReport(sources, design.name, { runs: 300, seed: 4 });
    expect(report.units).toBe(13);
    const peak = report.figures.find((figure) => figure.key === 'rampPeakV')!;
    expect(peak.values.length).toBe(13);
    // RW-0500's latest session counts, not its first.
    // Its seventh session (index 6, even: -1.5 mV) has the median peak 7.3 + 0.108 - 0.0015 V.
    expect(peak.values.some((value) => Math.abs(value - 7.4065) < 1e-9)).toBe(true);
    expect(peak.values.some((value) => Math.abs(value - 7.2985) < 1e-9)).toBe(false);
    expect(peak.bins.reduce((sum, bin) => sum + bin.count, 0)).toBe(13);
    const reference = analyseTolerances(design, { runs: 300, seed: 4 });
    expect(peak.prediction!.mean).toBe(reference.peakV.mean);
    expect(peak.prediction!.standardDeviation).toBe(reference.peakV.standardDeviation);
    // The bins span at least mean +- 3 sd, so the predicted counts hold 99.7 % of the units (normal table) or more.
    const predicted = peak.bins.reduce((sum, bin) => sum + (bin.predicted ?? 0), 0);
    expect(predicted).toBeGreaterThan(13 * 0.997 - 1e-6);
    expect(predicted).toBeLessThanOrEqual(13 + 1e-9);
    const gain = report.figures.find((figure) => figure.key === 'alphaGainDegPerV')!;
    expect(gain.prediction!.nominal).toBe(designFigures(design).alphaGainDegPerV.nominal);
    expect(peak.svg).toContain('Monte Carlo prediction');
  });

  it('recall pages are self-contained HTML with the warning in words and the flagged rows marked', async () => {
    const drift = driftPage(await driftReport(sources, 'RW-0500'));
    expect(drift).not.toMatch(/<script|src=|<link /i);
    expect(drift).toMatch(/<strong>Warning:<\/strong> Ramp peak: trend/);
    expect(drift.match(/<svg /g)!.length).toBe(5);
    // The fixture writes the slope as peak / 9.7 ms, so the slope climbs with the peak: both rows flagged.
    expect(drift.match(/<tr class="flagged"><td>(Ramp peak|Ramp slope)<\/td>/g)!.length).toBe(2);
    expect(drift.match(/<tr class="flagged">/g)!.length).toBe(2);
    const far = (await sources.logbook.listSessions({ unitSerial: 'RW-0611' }))[0].id;
    const comparison = comparisonPage(await compareReport(sources, sessionIds[0], far));
    expect(comparison).toMatch(/<tr class="flagged"><td>Ramp peak<\/td>.*yes \(flagged\)/);
    const fleet = fleetPage(await fleetReport(sources, chargerDesign().name, { runs: 100 }));
    expect(fleet).toContain('Monte Carlo prediction of the board model');
    expect(fleet.match(/<svg /g)!.length).toBe(2);
  });

  it('a unit against its design\'s fleet: marked on the histogram and placed by rank and by the prediction', async () => {
    const report = await fleetReport(sources, chargerDesign().name, { runs: 300, seed: 4, unitSerial: 'RW-0611' });
    const peak = report.figures.find((figure) => figure.key === 'rampPeakV')!;
    // RW-0611 has the fleet's highest peak, 7.1 + 0.44 = 7.54 V: above 12 of the 13 units.
    expect(peak.marked!.value).toBeCloseTo(7.54, 9);
    expect(peak.marked!.fleetFractionBelow).toBeCloseTo(12 / 13, 12);
    expect(peak.marked!.predictionZ!).toBeCloseTo((7.54 - peak.prediction!.mean) / peak.prediction!.standardDeviation, 9);
    expect(peak.svg).toContain('>RW-0611</text>');
    expect(fleetPage(report)).toMatch(/Unit RW-0611: 7\.540 V, above 92 % of the fleet, [+-]\d\.\d\d standard deviations from the predicted mean/);
    await expect(fleetReport(sources, chargerDesign().name, { unitSerial: 'RW-9999' })).rejects.toThrow(/unit "RW-9999" has no session of board design/);
  });
});
