/**
 * Board model figures: how fast the model, the inverse estimate, the tolerance analysis, the trim plan and sizing
 * run (the virtual board calls rampVoltageAt per sample; the Trim screen calls planTrim on every new reading).
 * Prints figures; asserts nothing.
 */
import { boardDesignSchema } from '../../app/board/design';
import { predictRamp, rampVoltageAt } from '../../app/board/rampModel';
import { sizeBoard } from '../../app/board/sizeBoard';
import { sizingTargetsSchema } from '../../app/board/sizingTargets';
import { analyseTolerances } from '../../app/board/toleranceAnalysis';
import { planTrim } from '../../app/board/trimPlan';

const board = boardDesignSchema.parse({
  name: 'Bench figure board', mainsHz: 50, rectifier: 'full-wave', supplyV: 15, rampTargetV: 5.5, alphaMaxDeg: 165,
  parts: { rEmitter: { ohm: 7500, ref: 'R7' }, rBiasTop: { ohm: 22000 }, rBiasBottom: { ohm: 100000 }, cRamp: { farad: 4.7e-7 }, rControlTop: { ohm: 18000 }, potControl: { ohm: 10000 } },
});

function timed(label: string, repeats: number, work: () => void): void {
  work();
  const start = process.hrtime.bigint();
  for (let index = 0; index < repeats; index += 1) work();
  const perCallS = Number(process.hrtime.bigint() - start) / 1e9 / repeats;
  const unit = perCallS < 1e-3 ? `${(perCallS * 1e6).toFixed(2)} us` : `${(perCallS * 1e3).toFixed(1)} ms`;
  console.log(`  ${label.padEnd(44)} ${unit} per call (${repeats} calls)`);
}

export async function run(): Promise<void> {
  timed('predictRamp', 2000, () => void predictRamp(board));
  const prediction = predictRamp(board);
  let sink = 0;
  const samples = 1_000_000;
  const start = process.hrtime.bigint();
  for (let index = 0; index < samples; index += 1) sink += rampVoltageAt(prediction, (index % 9700) * 1e-6);
  const seconds = Number(process.hrtime.bigint() - start) / 1e9;
  console.log(`  ${'rampVoltageAt'.padEnd(44)} ${(samples / seconds / 1e6).toFixed(1)} M samples/s (checksum ${sink.toFixed(0)})`);
  timed('analyseTolerances (500 runs + 128 corners)', 5, () => void analyseTolerances(board));
  const slow = predictRamp(board, { partOverrides: { cRamp: 5.6e-7 } });
  timed('planTrim (E24)', 10, () => void planTrim(board, { floorV: slow.floorV, peakV: slow.peakV, slopeVPerMs: slow.slopeVPerS / 1000, clipped: false }));
  timed('planTrim (E96)', 10, () => void planTrim(board, { floorV: slow.floorV, peakV: slow.peakV, slopeVPerMs: slow.slopeVPerS / 1000, clipped: false }, { series: 'E96' }));
  const targets = sizingTargetsSchema.parse({ mainsHz: 50, rectifier: 'full-wave', supplyV: 15, rampTargetV: 6, cRampFarad: 4.7e-7 });
  timed('sizeBoard (E24, with tolerance analysis)', 5, () => void sizeBoard(targets));
}
