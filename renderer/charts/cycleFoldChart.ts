/**
 * The cycle fold (NAMING.md): horizontal axis electrical degrees 0-360 of one mains cycle, the recent cycles drawn
 * over each other (older ones faint, the newest strong), zero crossings and firing points marked, the ramp target
 * line with its tolerance band. Scales are fixed: degrees always 0-360, volts only ever grow.
 *
 * Speed: chart.js keeps an element object per data point, which is most of a frame's cost with tens of thousands of
 * points. The newest cycle and the band are chart.js datasets; the faint earlier cycles (already min-max decimated)
 * are stroked by a plugin straight onto the chart's canvas in its scales, one path per signal
 * (scripts/bench/frame.ts measures both parts).
 */
import type { FoldCycle } from '../../app/contract/readings';
import { FoldPointsCache, foldRoles, growScale, type FoldRole } from '../shaping/foldPoints';
import type { Plugin } from 'chart.js';
import { createXyChart, cssColour, lineDataset, restyleChart, withAlpha, type Chart, type XyDataset } from './chartSetup';

export interface RampTarget {
  targetV: number;
  lowV: number | null;
  highV: number | null;
}

const roleNames: Record<FoldRole, string> = { sync: 'Sync', ramp: 'Ramp', gate: 'Gate', control: 'Control' };

export class CycleFoldChart {
  private readonly chart: Chart<'line', { x: number; y: number }[]>;
  private scale: { lowV: number; highV: number } | null = null;
  private markers: { zeroCrossingsDeg: number[]; firingDeg: number[] } = { zeroCrossingsDeg: [], firingDeg: [] };
  private older: Record<FoldRole, { x: number; y: number }[]> = { sync: [], ramp: [], gate: [], control: [] };
  private olderColours: Record<FoldRole, string> = { sync: '', ramp: '', gate: '', control: '' };
  /** Buckets per cycle for min-max decimation; about half the plot width in pixels. */
  private bucketCount = 400;
  private readonly pointsCache = new FoldPointsCache();
  cyclesShown = 0;
  /** Time of the last update's data shaping and of chart.js's update and draw (ms), for scripts/bench/frame.ts. */
  lastTimings = { shapingMs: 0, chartMs: 0, points: 0 };

  constructor(private readonly canvas: HTMLCanvasElement) {
    this.chart = createXyChart(canvas, { xTitle: 'Electrical degrees of one mains cycle', yTitle: 'Volts', xMin: 0, xMax: 360, xStep: 30, xTick: (value) => `${value}°`, yTick: (value) => `${value} V`, plugins: [this.olderCyclesPlugin(), this.markerPlugin()] });
    this.readOlderColours();
    this.chart.data.datasets = this.emptyDatasets();
    this.chart.update('none');
  }

  /** Forget the volts scale (a new session or a new board). */
  resetScale(): void {
    this.scale = null;
  }

  update(cycles: readonly FoldCycle[], target: RampTarget | null): void {
    const startMs = performance.now();
    this.bucketCount = Math.max(100, Math.round(this.canvas.clientWidth / 2) || 400);
    const points = this.pointsCache.points(cycles, { bucketCount: this.bucketCount, maxCycles: 20 });
    this.cyclesShown = points.cycles;
    const low = Math.min(points.lowV, target?.lowV ?? target?.targetV ?? Number.POSITIVE_INFINITY, 0);
    const high = Math.max(points.highV, target?.highV ?? target?.targetV ?? Number.NEGATIVE_INFINITY);
    this.scale = growScale(this.scale, low, high);
    const datasets = this.chart.data.datasets as XyDataset[];
    foldRoles.forEach((role, index) => {
      datasets[index].data = points.newest[role];
    });
    this.older = points.older;
    const band = datasets.length - 3;
    if (target) {
      datasets[band].data = target.lowV !== null ? [{ x: 0, y: target.lowV }, { x: 360, y: target.lowV }] : [];
      datasets[band + 1].data = target.highV !== null ? [{ x: 0, y: target.highV }, { x: 360, y: target.highV }] : [];
      datasets[band + 2].data = [{ x: 0, y: target.targetV }, { x: 360, y: target.targetV }];
    } else {
      datasets[band].data = datasets[band + 1].data = datasets[band + 2].data = [];
    }
    this.markers = { zeroCrossingsDeg: points.zeroCrossingsDeg, firingDeg: points.firingDeg };
    const y = this.chart.options.scales?.y;
    if (y) {
      y.min = this.scale.lowV;
      y.max = this.scale.highV;
    }
    const shapedMs = performance.now();
    this.chart.update('none');
    const olderPoints = foldRoles.reduce((sum, role) => sum + this.older[role].length, 0);
    this.lastTimings = { shapingMs: shapedMs - startMs, chartMs: performance.now() - shapedMs, points: olderPoints + datasets.reduce((sum, dataset) => sum + dataset.data.length, 0) };
  }

  restyle(): void {
    this.readOlderColours();
    this.chart.data.datasets = this.emptyDatasets().map((fresh, index) => ({ ...fresh, data: this.chart.data.datasets[index]?.data ?? [] }));
    restyleChart(this.chart);
  }

  /** True when something other than the background has been drawn (used by the end-to-end checks via the DOM). */
  hasData(): boolean {
    return (this.chart.data.datasets as XyDataset[]).some((dataset) => dataset.data.length > 0) || foldRoles.some((role) => this.older[role].length > 0);
  }

  destroy(): void {
    this.chart.destroy();
  }

  private emptyDatasets(): XyDataset[] {
    const datasets: XyDataset[] = [];
    for (const role of foldRoles) {
      const colour = cssColour(role);
      datasets.push(lineDataset(`${roleNames[role]}, newest cycle`, colour, [], { borderWidth: 2.2 }));
    }
    const ramp = cssColour('ramp');
    datasets.push(lineDataset('Ramp tolerance, low', withAlpha(ramp, 0.35), [], { borderWidth: 0.8, borderDash: [2, 3] }));
    datasets.push(lineDataset('Ramp tolerance, high', withAlpha(ramp, 0.35), [], { borderWidth: 0.8, borderDash: [2, 3], fill: '-1', backgroundColor: withAlpha(ramp, 0.12) }));
    datasets.push(lineDataset('Ramp target', ramp, [], { borderWidth: 1.2, borderDash: [8, 5] }));
    return datasets;
  }

  private readOlderColours(): void {
    for (const role of foldRoles) this.olderColours[role] = withAlpha(cssColour(role), 0.28);
  }

  /** The earlier cycles, faint, under the newest one: one path per signal, a gap (NaN) lifts the pen. */
  private olderCyclesPlugin(): Plugin<'line'> {
    return {
      id: 'foldEarlierCycles',
      beforeDatasetsDraw: (chart) => {
        const { ctx, chartArea, scales } = chart;
        const x = scales.x;
        const y = scales.y;
        if (!x || !y || !chartArea) return;
        // The scales are linear: one multiply-add per point instead of a scale call.
        const xScale = (chartArea.right - chartArea.left) / (x.max - x.min);
        const yScale = (chartArea.bottom - chartArea.top) / (y.max - y.min);
        ctx.save();
        ctx.beginPath();
        ctx.rect(chartArea.left, chartArea.top, chartArea.right - chartArea.left, chartArea.bottom - chartArea.top);
        ctx.clip();
        ctx.lineWidth = 1;
        ctx.lineJoin = 'round';
        for (const role of foldRoles) {
          const points = this.older[role];
          if (points.length === 0) continue;
          ctx.strokeStyle = this.olderColours[role];
          ctx.beginPath();
          let penDown = false;
          for (const point of points) {
            if (Number.isNaN(point.y)) {
              penDown = false;
              continue;
            }
            const px = chartArea.left + (point.x - x.min) * xScale;
            const py = chartArea.bottom - (point.y - y.min) * yScale;
            if (penDown) ctx.lineTo(px, py);
            else ctx.moveTo(px, py);
            penDown = true;
          }
          ctx.stroke();
        }
        ctx.restore();
      },
    };
  }

  /** Zero crossings as thin slate lines, firing points as plum ticks along the top edge. */
  private markerPlugin(): Plugin<'line'> {
    return {
      id: 'foldMarkers',
      afterDatasetsDraw: (chart) => {
        const { ctx, chartArea, scales } = chart;
        const x = scales.x;
        if (!x || !chartArea) return;
        ctx.save();
        ctx.font = '11px system-ui, sans-serif';
        ctx.strokeStyle = cssColour('sync');
        ctx.fillStyle = cssColour('sync');
        ctx.setLineDash([3, 3]);
        ctx.lineWidth = 1;
        for (const degrees of this.markers.zeroCrossingsDeg) {
          const px = x.getPixelForValue(degrees);
          ctx.beginPath();
          ctx.moveTo(px, chartArea.top);
          ctx.lineTo(px, chartArea.bottom);
          ctx.stroke();
        }
        ctx.setLineDash([]);
        if (this.markers.zeroCrossingsDeg.length > 0) ctx.fillText('zero crossing', Math.min(x.getPixelForValue(this.markers.zeroCrossingsDeg[0]) + 4, chartArea.right - 80), chartArea.bottom - 6);
        ctx.strokeStyle = cssColour('gate');
        ctx.fillStyle = cssColour('gate');
        ctx.lineWidth = 2;
        for (const degrees of this.markers.firingDeg) {
          const px = x.getPixelForValue(degrees);
          ctx.beginPath();
          ctx.moveTo(px - 5, chartArea.top);
          ctx.lineTo(px + 5, chartArea.top);
          ctx.lineTo(px, chartArea.top + 9);
          ctx.closePath();
          ctx.fill();
        }
        const latest = this.markers.firingDeg[this.markers.firingDeg.length - 1];
        if (latest !== undefined) ctx.fillText(`firing ${latest.toFixed(1)}°`, Math.min(x.getPixelForValue(latest) + 8, chartArea.right - 80), chartArea.top + 20);
        ctx.restore();
      },
    };
  }
}
