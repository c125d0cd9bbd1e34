/**
 * Timed edges from the logger (PROTOCOL.md "Timed edges"): sync zero crossings and gate pulse edges stamped by the
 * logger's timer to a microsecond or better, where the samples place them only to a fraction of a sample.
 * The analysis finds an edge in the samples first, then asks here for the timed edge of the same kind near it
 * and uses that instant when there is one: a sample-based reading is refined, never invented.
 *
 * Sync crossings: the logger's comparator switches at its own zero, which a DC offset on the sync (or the
 * comparator's own offset) moves: rising crossings early and falling ones late by the same time, so the high
 * half-cycle grows by twice that time and the low one shrinks by as much. The crossing is corrected by a quarter
 * of the difference between the two half-cycles around it, which puts it back on the offset-free sine's zero (the
 * sample-based analysis removes the offset too, by subtracting the mean over a cycle).
 * Memory is bounded: edges older than `keepS` before the newest are dropped.
 */
import type { EdgeRole, TimedEdge } from '../capture/samples';

export interface TimedEdgeBookOptions {
  /** Seconds of edges kept behind the newest (default 0.5 s: 25 cycles at 50 Hz). */
  keepS?: number;
}

export class TimedEdgeBook {
  private readonly keepS: number;
  private edges: TimedEdge[] = [];

  constructor(options: TimedEdgeBookOptions = {}) {
    this.keepS = options.keepS ?? 0.5;
  }

  get size(): number {
    return this.edges.length;
  }

  add(edges: readonly TimedEdge[]): void {
    if (edges.length === 0) return;
    for (const edge of edges) {
      // Edges arrive in time order; one out of order (a logger restart) starts the book again.
      const last = this.edges[this.edges.length - 1];
      if (last && edge.timeS < last.timeS) this.edges = [];
      this.edges.push(edge);
    }
    const oldestS = this.edges[this.edges.length - 1].timeS - this.keepS;
    let drop = 0;
    while (drop < this.edges.length && this.edges[drop].timeS < oldestS) drop++;
    if (drop > 0) this.edges.splice(0, drop);
  }

  clear(): void {
    this.edges = [];
  }

  /** The timed edge of this role and direction nearest `timeS`, within `toleranceS`; null when none. */
  nearest(role: EdgeRole, direction: TimedEdge['direction'], timeS: number, toleranceS: number): TimedEdge | null {
    let best: TimedEdge | null = null;
    for (let index = this.firstAtOrAfter(timeS - toleranceS); index < this.edges.length; index++) {
      const edge = this.edges[index];
      if (edge.timeS > timeS + toleranceS) break;
      if (edge.role !== role || edge.direction !== direction) continue;
      if (!best || Math.abs(edge.timeS - timeS) < Math.abs(best.timeS - timeS)) best = edge;
    }
    return best;
  }

  /**
   * The sync crossing `crossing` moved onto the offset-free zero, using the opposite crossings on either side
   * within `halfCycleS` x 1.5; null when either neighbour is missing (the first crossing of a run), since the offset
   * is then unknown.
   */
  syncCrossingS(crossing: TimedEdge, halfCycleS: number): number | null {
    const opposite = crossing.direction === 'rising' ? 'falling' : 'rising';
    const before = this.neighbour(opposite, crossing.timeS, -1, 1.5 * halfCycleS);
    const after = this.neighbour(opposite, crossing.timeS, 1, 1.5 * halfCycleS);
    if (before === null || after === null) return null;
    // Rising: high half-cycle after it, low before; falling: high before, low after.
    const highS = crossing.direction === 'rising' ? after - crossing.timeS : crossing.timeS - before;
    const lowS = crossing.direction === 'rising' ? crossing.timeS - before : after - crossing.timeS;
    const shiftS = (highS - lowS) / 4;
    return crossing.direction === 'rising' ? crossing.timeS + shiftS : crossing.timeS - shiftS;
  }

  private neighbour(direction: TimedEdge['direction'], timeS: number, side: -1 | 1, withinS: number): number | null {
    let found: number | null = null;
    for (const edge of this.edges) {
      if (edge.role !== 'sync' || edge.direction !== direction) continue;
      const distance = (edge.timeS - timeS) * side;
      if (distance <= 0 || distance > withinS) continue;
      if (found === null || distance < (found - timeS) * side) found = edge.timeS;
    }
    return found;
  }

  private firstAtOrAfter(timeS: number): number {
    let low = 0;
    let high = this.edges.length;
    while (low < high) {
      const middle = (low + high) >> 1;
      if (this.edges[middle].timeS < timeS) low = middle + 1;
      else high = middle;
    }
    return low;
  }
}
