/**
 * The board as the virtual board builds it: the design, changed by the board faults, put through the one ramp
 * model (app/board/rampModel.ts). Nothing here models the ramp a second time; faults only change part values
 * or timing.
 */
import type { BoardDesign, PartRole } from '../board/design';
import { designValueOf } from '../board/measuredParts';
import { boardPartValues, type PartOverrides } from '../board/parts';
import { predictRamp, type RampPrediction } from '../board/rampModel';
import { InputError } from '../errors';
import type { BoardFaultName } from './faults';

/** Factors of the part faults (our own scenario values: a wrong part two preferred-value steps away). */
export const wrongEmitterFactor = 1.5;
export const lowCapacitorFactor = 0.7;
/**
 * `stacked-tolerances`: where each part sits, as a share of its own tolerance (our scenario values): all inside
 * their tolerance, all to the side that lowers the ramp.
 */
export const stackedToleranceShare = { rBiasBottom: 0.8, cRamp: 0.9 } as const;
/** Extra sync lag of `sync-phase-shift` (degrees). */
export const syncShiftDeg = 20;
/** DC offset of `sync-offset`, as a fraction of the sync peak (our scenario value). */
export const syncOffsetFraction = 0.03;
/** `clipped-ramp`: the active-region rise asked for, as a multiple of the room up to the clipping level. */
const clipOverdrive = 1.35;

export interface FittedBoard {
  design: BoardDesign;
  partOverrides: PartOverrides;
  prediction: RampPrediction;
  /** Time constant of the reset discharge: discharge resistor times ramp capacitor (s). */
  dischargeTimeConstantS: number;
  /** Level the ramp settles to while held in reset: charging current through the discharge resistor (V). */
  resetSettledV: number;
  /** Extra lag of the ramp reset behind the sync test point's zero crossing (s). */
  extraSyncLagS: number;
  /**
   * DC offset on the sync, as a fraction of its peak. The board's reset detector sees the offset sine cross zero
   * asin(fraction)/(2 pi f) before each rising mains crossing and as much after each falling one.
   */
  syncOffsetFraction: number;
}

function overdrivenCapacitor(design: BoardDesign, overrides: PartOverrides): number {
  let farad = boardPartValues(design, overrides).cRampFarad;
  for (let pass = 0; pass < 12; pass++) {
    const prediction = predictRamp(design, { partOverrides: { ...overrides, cRamp: farad } });
    if (prediction.clipped && prediction.headroomV < -0.2 * (prediction.clipV - prediction.floorV)) return farad;
    const unclippedRiseV = prediction.clipV - prediction.headroomV - prediction.floorV;
    const wantedRiseV = clipOverdrive * (prediction.clipV - prediction.floorV);
    // The rise goes as 1/C (slope = I/C); the Early effect bends it a little, hence the passes.
    farad *= Math.min(0.9, unclippedRiseV / wantedRiseV);
  }
  return farad;
}

/** The positions each part fault puts a wrong value at: a new part fitted at all of them takes the fault out. */
export const partFaultPositions: Partial<Record<BoardFaultName, readonly PartRole[]>> = {
  'wrong-emitter-resistor': ['rEmitter'],
  'capacitor-low': ['cRamp'],
  'clipped-ramp': ['cRamp'],
  'stacked-tolerances': Object.keys(stackedToleranceShare) as PartRole[],
};

/** The faults still acting once parts were fitted at `replaced` (link and timing faults always act). */
export function faultsStillActing<Fault extends string>(faults: readonly Fault[], replaced: readonly PartRole[]): Fault[] {
  return faults.filter((fault) => {
    const positions = partFaultPositions[fault as BoardFaultName];
    return !positions || !positions.every((position) => replaced.includes(position));
  });
}

/**
 * The board with its faults. `replaced` lists positions where the technician has fitted a new part since: a part
 * fault no longer applies there (the design then carries the fitted value).
 */
export function fitBoard(design: BoardDesign, faults: readonly BoardFaultName[], replaced: readonly PartRole[] = []): FittedBoard {
  if (faults.includes('wrong-half-cycle-pulses') && design.rectifier !== 'half-wave') {
    throw new InputError('the fault wrong-half-cycle-pulses applies to half-wave boards only: a full-wave board fires in every half-cycle by design', '--fault');
  }
  const overrides: PartOverrides = {};
  if (faults.includes('stacked-tolerances')) {
    for (const [part, share] of Object.entries(stackedToleranceShare) as [keyof typeof stackedToleranceShare, number][]) {
      const value = designValueOf(design, part) as number;
      overrides[part] = value * (1 + (share * design.parts[part].tolerancePct) / 100);
    }
  }
  if (faults.includes('wrong-emitter-resistor')) overrides.rEmitter = design.parts.rEmitter.ohm * wrongEmitterFactor;
  if (faults.includes('capacitor-low')) overrides.cRamp = design.parts.cRamp.farad * lowCapacitorFactor;
  if (faults.includes('clipped-ramp')) overrides.cRamp = overdrivenCapacitor(design, overrides);
  for (const part of replaced) delete overrides[part];
  const prediction = predictRamp(design, { partOverrides: overrides });
  const values = boardPartValues(design, overrides);
  return {
    design,
    partOverrides: overrides,
    prediction,
    dischargeTimeConstantS: values.rDischargeOhm * values.cRampFarad,
    resetSettledV: prediction.chargingCurrentA * values.rDischargeOhm,
    extraSyncLagS: faults.includes('sync-phase-shift') ? syncShiftDeg / (360 * design.mainsHz) : 0,
    syncOffsetFraction: faults.includes('sync-offset') ? syncOffsetFraction : 0,
  };
}
