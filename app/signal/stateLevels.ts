/**
 * State levels, reference levels and crossing instants of a two-level waveform, IEEE Std 181 (IEC 60469):
 * histogram of the record (100 bins by default) between its lowest and highest values, split in two halves;
 * the low and high state levels are the modes (bin centres) of the lower and upper halves.
 */
export interface StateLevels {
  lowV: number;
  highV: number;
  /** Histogram bin width (V): the resolution of the levels. */
  binWidthV: number;
}

export function stateLevelsByHistogram(values: ArrayLike<number>, options: { bins?: number } = {}): StateLevels | null {
  const bins = Math.max(2, Math.floor(options.bins ?? 100));
  let minV = Number.POSITIVE_INFINITY;
  let maxV = Number.NEGATIVE_INFINITY;
  for (let i = 0; i < values.length; i++) {
    const value = values[i];
    if (value < minV) minV = value;
    if (value > maxV) maxV = value;
  }
  if (!Number.isFinite(minV) || !Number.isFinite(maxV)) return null;
  if (maxV === minV) return { lowV: minV, highV: maxV, binWidthV: 0 };
  const binWidthV = (maxV - minV) / bins;
  const counts = new Uint32Array(bins);
  for (let i = 0; i < values.length; i++) {
    counts[Math.min(bins - 1, Math.floor((values[i] - minV) / binWidthV))] += 1;
  }
  const half = bins >> 1;
  const lowBin = modeBin(counts, 0, half);
  const highBin = modeBin(counts, half, bins);
  return { lowV: minV + (lowBin + 0.5) * binWidthV, highV: minV + (highBin + 0.5) * binWidthV, binWidthV };
}

function modeBin(counts: Uint32Array, from: number, to: number): number {
  let best = from;
  for (let bin = from + 1; bin < to; bin++) if (counts[bin] > counts[best]) best = bin;
  return best;
}

export interface ReferenceLevels {
  /** 10 % of the low-to-high span above the low level (IEEE 181 proximal). */
  proximalV: number;
  /** 50 % (IEEE 181 mesial). */
  mesialV: number;
  /** 90 % (IEEE 181 distal). */
  distalV: number;
}

export function referenceLevels(levels: { lowV: number; highV: number }, options: { proximalPct?: number; mesialPct?: number; distalPct?: number } = {}): ReferenceLevels {
  const spanV = levels.highV - levels.lowV;
  return {
    proximalV: levels.lowV + (spanV * (options.proximalPct ?? 10)) / 100,
    mesialV: levels.lowV + (spanV * (options.mesialPct ?? 50)) / 100,
    distalV: levels.lowV + (spanV * (options.distalPct ?? 90)) / 100,
  };
}

export interface LevelCrossing {
  /** Sub-sample index of the crossing (linear interpolation between the bracketing samples, IEEE 181). */
  index: number;
  direction: 'rising' | 'falling';
}

/**
 * Every crossing of `levelV`, at sub-sample positions. A sample exactly on the level counts as being on the side it came from,
 * so a record that touches the level without passing it yields nothing.
 */
export function levelCrossings(values: ArrayLike<number>, levelV: number): LevelCrossing[] {
  const crossings: LevelCrossing[] = [];
  let lastSide = 0;
  let lastIndex = -1;
  for (let i = 0; i < values.length; i++) {
    const side = values[i] > levelV ? 1 : values[i] < levelV ? -1 : 0;
    if (side === 0) continue;
    if (lastSide !== 0 && side !== lastSide) {
      const before = values[lastIndex];
      const after = values[i];
      // Interpolate between the last sample on the old side and the first on the new side.
      const fraction = (levelV - before) / (after - before);
      crossings.push({ index: lastIndex + fraction * (i - lastIndex), direction: side > 0 ? 'rising' : 'falling' });
    }
    lastSide = side;
    lastIndex = i;
  }
  return crossings;
}

/** Transition duration 10 % -> 90 % (or 90 % -> 10 %) of the first transition in the record, in samples; null when there is none. */
export function transitionDurationSamples(values: ArrayLike<number>, levels: { lowV: number; highV: number }): number | null {
  const reference = referenceLevels(levels);
  const mesial = levelCrossings(values, reference.mesialV)[0];
  if (!mesial) return null;
  const proximal = levelCrossings(values, reference.proximalV);
  const distal = levelCrossings(values, reference.distalV);
  const [firstLevel, secondLevel] = mesial.direction === 'rising' ? [proximal, distal] : [distal, proximal];
  const start = [...firstLevel].reverse().find((crossing) => crossing.index <= mesial.index && crossing.direction === mesial.direction);
  const end = secondLevel.find((crossing) => crossing.index >= mesial.index && crossing.direction === mesial.direction);
  return start && end ? end.index - start.index : null;
}
