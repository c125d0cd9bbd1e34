/**
 * Cycle fold frame time in Debian's Chromium (headless, software rendering): 20 folded cycles at 50 kS/s on 50 Hz,
 * one new cycle per frame, through our min-max decimation and chart.js. Prints figures against the 60 fps budget
 * (16.7 ms per frame); it is a benchmark, never a timed test. Run: npx tsx scripts/bench/frame.ts
 */
import { build } from 'esbuild';
import { chromium } from 'playwright-core';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');

function percentile(values: number[], fraction: number): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.floor(fraction * sorted.length))];
}

export async function run(): Promise<void> {
  const bundle = await build({ entryPoints: [join(root, 'renderer/bench/frameHarness.ts')], bundle: true, write: false, format: 'iife', platform: 'browser', target: 'es2022' });
  const css = readFileSync(join(root, 'renderer/static/styles.css'), 'utf8');
  const browser = await chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
  try {
    const { loadavg, cpus } = await import('node:os');
    console.log(`machine: ${cpus().length} cores, load average ${loadavg()[0].toFixed(1)} (figures scale with other work on the machine)`);
    const page = await browser.newPage({ viewport: { width: 1400, height: 700 }, deviceScaleFactor: 1 });
    await page.setContent(`<!doctype html><html data-theme="light"><head><style>${css}</style></head><body><div class="plot" id="box"><canvas id="fold"></canvas></div></body></html>`);
    await page.addScriptTag({ content: bundle.outputFiles[0].text });
    const frames = 300;
    const figures = await page.evaluate((count) => (window as unknown as { runFrameBench(frames: number): Promise<{ workMs: number[]; intervalMs: number[]; shapingMs: number[]; chartMs: number[]; points: number }> }).runFrameBench(count), frames);
    const work = figures.workMs.slice(20); // the first frames include chart.js warming up
    const interval = figures.intervalMs.slice(20);
    const mean = (values: number[]) => values.reduce((sum, value) => sum + value, 0) / values.length;
    const budgetMs = 1000 / 60;
    console.log('cycle fold frame (20 cycles x 1000 samples x 4 signals per frame, plot 1400 px wide, Chromium headless, software rendering)');
    console.log(`  work per frame: mean ${mean(work).toFixed(2)} ms, median ${percentile(work, 0.5).toFixed(2)} ms, p95 ${percentile(work, 0.95).toFixed(2)} ms, max ${Math.max(...work).toFixed(2)} ms`);
    console.log(`  of which our decimation ${mean(figures.shapingMs.slice(20)).toFixed(2)} ms, chart.js update and draw ${mean(figures.chartMs.slice(20)).toFixed(2)} ms (mean); ${figures.points} points reach the chart per frame from ${20 * 4 * 1000} samples`);
    console.log(`  frame interval: mean ${mean(interval).toFixed(2)} ms (${(1000 / mean(interval)).toFixed(1)} fps achieved)`);
    console.log(`  60 fps budget ${budgetMs.toFixed(1)} ms: ${((100 * work.filter((value) => value <= budgetMs).length) / work.length).toFixed(1)} % of frames within it; mean uses ${((100 * mean(work)) / budgetMs).toFixed(0)} % of it`);
  } finally {
    await browser.close();
  }
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  run().catch((error: unknown) => {
    console.error(error);
    process.exit(1);
  });
}
