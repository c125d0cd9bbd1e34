/**
 * A firing interval's angle, period and pulse width from the logger's timed edges, where it has them (app/signal/
 * timedEdges.ts). The sample-based analysis finds the crossings and pulses; each instant is then replaced by the
 * timed edge of the same kind within `toleranceS` of it. Anything not matched keeps its sample-based value.
 */
import type { TimedEdgeBook } from '../signal/timedEdges';
import type { Rectifier } from './readings';

export interface SampledFiring {
  rectifier: Rectifier;
  direction: 'rising' | 'falling';
  /** Sample-based instants (s): the interval's starting crossing, its closing crossing, the crossing before the start (NaN when unknown). */
  startS: number;
  endS: number;
  priorS: number;
  /** Rising edge of the first pulse in the right half-cycle, null when none fired. */
  riseS: number | null;
  syncPhaseDeg: number;
  toleranceS: number;
}

export interface TimedFiring {
  periodS: number;
  /** Null when no pulse fired, its rising edge was not timed, or the starting crossing could not be put on the mains zero. */
  alphaDeg: number | null;
}

/** The interval from timed edges; null when its starting crossing or the crossings giving the period were not timed. */
export function timedFiring(book: TimedEdgeBook, sampled: SampledFiring): TimedFiring | null {
  const { direction, toleranceS } = sampled;
  const start = book.nearest('sync', direction, sampled.startS, toleranceS);
  if (!start) return null;
  // The period between crossings of one direction: a comparator offset moves both alike.
  // Half-wave: start to the next crossing of its direction; full-wave: the crossings either side, both the other way.
  const other = direction === 'rising' ? 'falling' : 'rising';
  const halfWave = sampled.rectifier === 'half-wave';
  if (!halfWave && Number.isNaN(sampled.priorS)) return null;
  const periodFrom = halfWave ? start : book.nearest('sync', other, sampled.priorS, toleranceS);
  const periodTo = book.nearest('sync', halfWave ? direction : other, sampled.endS, toleranceS);
  if (!periodFrom || !periodTo) return null;
  const periodS = periodTo.timeS - periodFrom.timeS;
  if (!(periodS > 0)) return null;
  const rise = sampled.riseS === null ? null : book.nearest('gate', 'rising', sampled.riseS, toleranceS);
  const crossingS = book.syncCrossingS(start, periodS / 2);
  if (!rise || crossingS === null) return { periodS, alphaDeg: null };
  return { periodS, alphaDeg: (360 * (rise.timeS - crossingS)) / periodS + sampled.syncPhaseDeg };
}

/** A pulse's width (us) from its timed edges, or null when either edge was not timed. */
export function timedWidthUs(book: TimedEdgeBook, riseS: number, fallS: number, toleranceS: number): number | null {
  const rise = book.nearest('gate', 'rising', riseS, toleranceS);
  const fall = book.nearest('gate', 'falling', fallS, toleranceS);
  return rise && fall && fall.timeS > rise.timeS ? (fall.timeS - rise.timeS) * 1e6 : null;
}
