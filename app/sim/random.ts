/**
 * Seeded pseudo-random numbers for the virtual board, so a seed always gives the same capture.
 * mulberry32 (a 32-bit generator in common use, from memory) for the per-sample stream; a hash of
 * (seed, index, salt) for per-half-cycle choices, so those do not depend on how samples are cut into blocks.
 */
export interface SeededRandom {
  /** Uniform in [0, 1). */
  next(): number;
  /** Standard normal (Box-Muller). */
  gaussian(): number;
}

export function createSeededRandom(seed: number): SeededRandom {
  let state = (Math.floor(seed) ^ 0x9e3779b9) >>> 0;
  let spare: number | null = null;
  const next = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let mixed = state;
    mixed = Math.imul(mixed ^ (mixed >>> 15), mixed | 1);
    mixed ^= mixed + Math.imul(mixed ^ (mixed >>> 7), mixed | 61);
    return ((mixed ^ (mixed >>> 14)) >>> 0) / 4294967296;
  };
  const gaussian = (): number => {
    if (spare !== null) {
      const value = spare;
      spare = null;
      return value;
    }
    const radius = Math.sqrt(-2 * Math.log(1 - next()));
    const angle = 2 * Math.PI * next();
    spare = radius * Math.sin(angle);
    return radius * Math.cos(angle);
  };
  return { next, gaussian };
}

/** A uniform number in [0, 1) fixed by (seed, index, salt): the same half-cycle always gets the same draw. */
export function hashedUnit(seed: number, index: number, salt: number): number {
  let hash = Math.imul(Math.floor(seed) ^ 0x85ebca6b, 0x27d4eb2d) ^ Math.imul(Math.floor(index) | 0, 0x165667b1) ^ Math.imul(salt, 0x9e3779b1);
  hash = Math.imul(hash ^ (hash >>> 16), 0x85ebca6b);
  hash = Math.imul(hash ^ (hash >>> 13), 0xc2b2ae35);
  return ((hash ^ (hash >>> 16)) >>> 0) / 4294967296;
}

/** A standard normal fixed by (seed, index, salt). */
export function hashedGaussian(seed: number, index: number, salt: number): number {
  const first = hashedUnit(seed, index, salt);
  const second = hashedUnit(seed, index, salt + 7919);
  return Math.sqrt(-2 * Math.log(1 - first)) * Math.cos(2 * Math.PI * second);
}
