/**
 * Cramer-Rao lower bounds for a real sinusoid in white Gaussian noise (REFERENCES.md: Kay, Fundamentals of Statistical
 * Signal Processing I; Rife and Boorstyn, IEEE Trans. Inf. Theory 1974), eta = A^2 / (2 sigma^2), N samples:
 * var(f) >= 12 / ((2 pi)^2 eta N (N^2 - 1)) with f in cycles per sample; var(phase) >= 2 (2N - 1) / (eta N (N + 1)),
 * phase at the first sample, rad. The yardstick for how exactly zero crossings can time a sine.
 */
export interface SineRecord {
  amplitudeV: number;
  noiseSigmaV: number;
  samples: number;
  sampleRateHz: number;
}

function signalToNoise(record: SineRecord): number {
  return (record.amplitudeV * record.amplitudeV) / (2 * record.noiseSigmaV * record.noiseSigmaV);
}

/** Standard-deviation bound of a frequency estimate (Hz). */
export function frequencyBoundHz(record: SineRecord): number {
  const eta = signalToNoise(record);
  const n = record.samples;
  const varianceCyclesPerSample = 12 / ((2 * Math.PI) ** 2 * eta * n * (n * n - 1));
  return Math.sqrt(varianceCyclesPerSample) * record.sampleRateHz;
}

/** Standard-deviation bound of a phase estimate at the first sample (rad). */
export function phaseBoundRad(record: SineRecord): number {
  const eta = signalToNoise(record);
  const n = record.samples;
  return Math.sqrt((2 * (2 * n - 1)) / (eta * n * (n + 1)));
}

/** The phase bound as a timing bound (s) at frequency `frequencyHz`. */
export function timingBoundS(record: SineRecord, frequencyHz: number): number {
  return phaseBoundRad(record) / (2 * Math.PI * frequencyHz);
}
