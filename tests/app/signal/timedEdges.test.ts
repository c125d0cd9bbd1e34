/**
 * The book of timed edges: finding the edge that matches one found in the samples, taking a comparator offset out
 * of a sync crossing, bounded memory.
 */
import { describe, expect, it } from 'vitest';
import type { TimedEdge } from '../../../app/capture/samples';
import { TimedEdgeBook } from '../../../app/signal/timedEdges';

/** Where a comparator at 0 V switches on A sin(2 pi f t) + d: rising early, falling late by asin(d / A) / (2 pi f). */
function offsetSyncEdges(frequencyHz: number, fraction: number, cycles: number): TimedEdge[] {
  const shiftS = Math.asin(fraction) / (2 * Math.PI * frequencyHz);
  const periodS = 1 / frequencyHz;
  const edges: TimedEdge[] = [];
  for (let cycle = 0; cycle < cycles; cycle++) {
    edges.push({ role: 'sync', direction: 'rising', timeS: cycle * periodS - shiftS + 1 });
    edges.push({ role: 'sync', direction: 'falling', timeS: cycle * periodS + periodS / 2 + shiftS + 1 });
  }
  return edges;
}

describe('timed edge book', () => {
  it('takes a DC offset on the sync out of the crossings: back on the mains zero (exact arithmetic, asin)', () => {
    const book = new TimedEdgeBook();
    const edges = offsetSyncEdges(60, 0.04, 6);
    book.add(edges);
    const periodS = 1 / 60;
    // Crossings with a neighbour on each side: the rising ones of cycles 1..5, the falling ones of cycles 0..4.
    for (const edge of edges.slice(1, -1)) {
      const cycle = Math.round((edge.timeS - 1) / periodS - (edge.direction === 'falling' ? 0.5 : 0));
      const mainsS = 1 + cycle * periodS + (edge.direction === 'falling' ? periodS / 2 : 0);
      expect(book.syncCrossingS(edge, periodS / 2)).toBeCloseTo(mainsS, 12);
    }
    // Without both neighbours the offset is unknown.
    expect(book.syncCrossingS(edges[0], periodS / 2)).toBeNull();
  });

  it('finds the nearest edge of the role and direction asked, within the tolerance only', () => {
    const book = new TimedEdgeBook();
    book.add([
      { role: 'gate', direction: 'rising', timeS: 0.0101 },
      { role: 'sync', direction: 'rising', timeS: 0.0102 },
      { role: 'gate', direction: 'falling', timeS: 0.0104 },
      { role: 'gate', direction: 'rising', timeS: 0.0301 },
    ]);
    expect(book.nearest('gate', 'rising', 0.0103, 0.0005)?.timeS).toBe(0.0101);
    expect(book.nearest('gate', 'rising', 0.02, 0.0005)).toBeNull();
    expect(book.nearest('sync', 'falling', 0.0102, 0.001)).toBeNull();
    expect(book.nearest('gate', 'rising', 0.0299, 0.0005)?.timeS).toBe(0.0301);
  });

  it('keeps only the last keepS seconds, and starts again when time goes backwards (a logger restart)', () => {
    const book = new TimedEdgeBook({ keepS: 0.1 });
    book.add(Array.from({ length: 100 }, (_, index) => ({ role: 'sync' as const, direction: 'rising' as const, timeS: index * 0.01 })));
    expect(book.size).toBe(11);
    book.add([{ role: 'gate', direction: 'rising', timeS: 0.005 }]);
    expect(book.size).toBe(1);
  });
});
