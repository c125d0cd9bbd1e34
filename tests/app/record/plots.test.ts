/** Figures and their SVG: ticks, escaping, the fold's degrees and marks, verdict words, the capture digest text. */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { FoldCycle } from '../../../app/contract';
import { buildChart, niceTicks } from '../../../app/record/chart';
import { escapeXml, figureToSvg } from '../../../app/record/figure';
import { foldFigure, signalColours } from '../../../app/record/plots';
import { captureDigestText, formatReading, verdictWords } from '../../../app/record/recordModel';

describe('chart', () => {
  it('round-number ticks in 1-2-5 steps cover the range', () => {
    // Hand-worked: 0..1 in about five steps is 0.2; 7.08..7.52 is 0.1; -12..12 is 5.
    expect(niceTicks(0, 1)).toEqual([0, 0.2, 0.4, 0.6000000000000001, 0.8, 1]);
    expect(niceTicks(7.08, 7.52).map((tick) => Number(tick.toFixed(6)))).toEqual([7.1, 7.2, 7.3, 7.4, 7.5]);
    expect(niceTicks(-12, 12)).toEqual([-10, -5, 0, 5, 10]);
    fc.assert(
      fc.property(fc.double({ min: -1e4, max: 1e4, noNaN: true }), fc.double({ min: 1e-3, max: 1e4, noNaN: true }), (low, span) => {
        const ticks = niceTicks(low, low + span);
        expect(ticks.length).toBeGreaterThanOrEqual(2);
        expect(ticks.length).toBeLessThanOrEqual(11);
        for (const tick of ticks) {
          expect(tick).toBeGreaterThanOrEqual(low - span * 1e-6);
          expect(tick).toBeLessThanOrEqual(low + span * (1 + 1e-6));
        }
      }),
      { numRuns: 200 },
    );
  });

  it('puts data inside the plot box and never draws a segment across a missing value', () => {
    const figure = buildChart({ title: 't', xLabel: 'x', yLabel: 'y', xRange: [0, 10], yRange: [0, 10], series: [{ kind: 'line', x: [0, 5, 6, 10], y: [0, 5, Number.NaN, 10], colour: '#000000' }] });
    const lines = figure.items.filter((item) => item.kind === 'path' && item.stroke === '#000000');
    expect(lines.length).toBe(1); // the lone point after the gap makes no segment
    const coordinates = (lines[0] as { d: string }).d.match(/-?\d+(\.\d+)?/g)!.map(Number);
    for (let i = 0; i < coordinates.length; i += 2) {
      expect(coordinates[i]).toBeGreaterThanOrEqual(62);
      expect(coordinates[i]).toBeLessThanOrEqual(640 - 16);
    }
  });

  it('escapes text in SVG', () => {
    expect(escapeXml(`R1 < 10 k & "5 %" 'x'`)).toBe('R1 &lt; 10 k &amp; &quot;5 %&quot; &#39;x&#39;');
    const svg = figureToSvg({ widthPx: 10, heightPx: 10, title: 'a<b', items: [{ kind: 'text', x: 1, y: 1, text: '<script>', sizePx: 5, colour: '#000', anchor: 'start' }] });
    expect(svg).not.toContain('<script>');
    expect(svg).toContain('<title>a&lt;b</title>');
  });
});

describe('cycle fold figure', () => {
  const trace = (values: number[]) => ({ deg: values.map((_, index) => (index * 360) / (values.length - 1)), v: values });
  const cycle = (index: number): FoldCycle => ({
    index, startS: index * 0.02, periodMs: 20,
    sync: trace([0, 10, 0, -10, 0]), ramp: trace([0, 3.6, 7.3, 0, 0]), gate: trace([0, 0, 15, 0, 0]), control: null,
    zeroCrossingsDeg: [0, 180, 360], firingDeg: [90],
  });

  it('spans 0-360 degrees, uses the NAMING.md colours and marks zero crossings and the firing point', () => {
    const svg = figureToSvg(foldFigure([cycle(0), cycle(1), cycle(2)]));
    for (const colour of [signalColours.sync, signalColours.ramp, signalColours.gate]) expect(svg).toContain(`stroke="${colour}"`);
    for (const tick of ['0', '90', '180', '270', '360']) expect(svg).toContain(`>${tick}</text>`);
    expect(svg).toContain('firing 90.0 deg');
    expect(svg.match(/>zero crossing<\/text>/g)!.length).toBe(2); // 0 and 180; the 360 line is unlabelled
    // Older cycles are drawn fainter than the newest.
    expect(svg).toMatch(/opacity="0\.35"/);
  });
});

describe('record words', () => {
  it('verdicts carry text and a symbol, never colour alone', () => {
    for (const words of Object.values(verdictWords)) {
      expect(words.text.length).toBeGreaterThan(4);
      expect(words.symbol.length).toBe(1);
    }
    // Four states, four symbols; "not measured yet" is neither a tick nor a cross.
    expect(new Set(Object.values(verdictWords).map((words) => words.symbol)).size).toBe(4);
    expect(verdictWords['not-measured'].symbol).not.toMatch(/[\u2713\u2717]/);
  });

  it('readings print with units and sensible digits', () => {
    expect(formatReading(7.30146, 'V')).toBe('7.301 V');
    expect(formatReading(144.306, 'deg')).toBe('144.3 deg');
    expect(formatReading(0, '')).toBe('0');
    expect(formatReading(false, '')).toBe('no');
    expect(formatReading(null, 'V')).toBe('-');
  });

  it('the digest text orders captures by start and ends every line', () => {
    const text = captureDigestText([
      { startedAt: '2026-11-20T08:31:00.000Z', startS: 0, sha256: 'B'.repeat(64) },
      { startedAt: '2026-11-20T08:30:00.000Z', startS: 5, sha256: 'a'.repeat(64) },
    ]);
    expect(text).toBe(`rampwright-captures-v1\n${'a'.repeat(64)}\n${'b'.repeat(64)}\n`);
  });
});
