/**
 * Frame-time harness for scripts/bench/frame.ts (never part of the app bundle): draws the cycle fold with 20 cycles
 * of full-resolution samples at 50 kS/s on 50 Hz mains (1000 samples per cycle per signal), one new cycle per
 * frame, and reports how long each frame's work took: our decimation, chart.js update and draw.
 */
import type { FoldCycle, FoldTrace } from '../../app/contract/readings';
import { CycleFoldChart } from '../charts/cycleFoldChart';

const sampleRateHz = 50_000;
const mainsHz = 50;

function syntheticCycle(index: number): FoldCycle {
  const count = sampleRateHz / mainsHz;
  const trace = (value: (degrees: number) => number): FoldTrace => {
    const deg: number[] = new Array(count);
    const v: number[] = new Array(count);
    for (let k = 0; k < count; k++) {
      deg[k] = (k * 360) / count;
      v[k] = value(deg[k]) + 0.02 * Math.sin(k * 12.9898 + index * 78.233);
    }
    return { deg, v };
  };
  const alphaDeg = 90 + 1.5 * Math.sin(index / 3);
  const within = (degrees: number) => degrees % 180;
  return {
    index,
    startS: index / mainsHz,
    periodMs: 1000 / mainsHz,
    sync: trace((degrees) => 9 * Math.sin((degrees * Math.PI) / 180)),
    ramp: trace((degrees) => (within(degrees) < 3 ? 0.1 : (6.1 * (within(degrees) - 3)) / 177)),
    gate: trace((degrees) => (within(degrees) >= alphaDeg && within(degrees) < alphaDeg + 3.6 ? 5 : 0)),
    control: trace(() => 3),
    zeroCrossingsDeg: [0, 180, 360],
    firingDeg: [alphaDeg, alphaDeg + 180],
  };
}

export interface FrameFigures {
  frames: number;
  workMs: number[];
  intervalMs: number[];
  shapingMs: number[];
  chartMs: number[];
  points: number;
}

async function runFrameBench(frames: number): Promise<FrameFigures> {
  const canvas = document.getElementById('fold') as HTMLCanvasElement;
  const chart = new CycleFoldChart(canvas);
  const cycles: FoldCycle[] = Array.from({ length: 20 }, (_, index) => syntheticCycle(index));
  const workMs: number[] = [];
  const intervalMs: number[] = [];
  const shapingMs: number[] = [];
  const chartMs: number[] = [];
  let last = performance.now();
  for (let frame = 0; frame < frames; frame++) {
    await new Promise<void>((resolve) => requestAnimationFrame(() => resolve()));
    const start = performance.now();
    intervalMs.push(start - last);
    last = start;
    cycles.shift();
    cycles.push(syntheticCycle(20 + frame));
    chart.update(cycles, { targetV: 6, lowV: 5.82, highV: 6.18 });
    workMs.push(performance.now() - start);
    shapingMs.push(chart.lastTimings.shapingMs);
    chartMs.push(chart.lastTimings.chartMs);
  }
  const points = chart.lastTimings.points;
  chart.destroy();
  return { frames, workMs, intervalMs, shapingMs, chartMs, points };
}

(window as unknown as { runFrameBench: typeof runFrameBench }).runFrameBench = runFrameBench;
