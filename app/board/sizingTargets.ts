/**
 * What a designer asks `size` for (validated at the edge with zod, like the design file): supply, mains,
 * rectifier, ramp height, the capacitor already chosen, the E-series to buy from, how much of the supply the
 * emitter resistor drops, and the divider current.
 */
import { z } from 'zod';
import { eSeriesNames } from './eSeries';
import { transistorSchema } from './design';
import { designRanges, rangedNumber } from './designRanges';
import { defaultControlPotOhm } from './parts';

export const sizingTargetsSchema = z.object({
  name: z.string().min(1).max(200).default('Sized board'),
  mainsHz: z.number().min(45, 'mains frequency must be 45-65 Hz').max(65, 'mains frequency must be 45-65 Hz'),
  rectifier: z.enum(['half-wave', 'full-wave']),
  supplyV: rangedNumber(designRanges.supplyV),
  rampTargetV: rangedNumber(designRanges.rampTargetV),
  cRampFarad: rangedNumber(designRanges.rampCapacitorFarad),
  capacitorTolerancePct: z.number().min(0).max(80).default(10),
  series: z.enum(eSeriesNames as [string, ...string[]]).default('E24'),
  /**
   * Share of the supply across the emitter resistor. A larger drop makes the current less sensitive to V_EB
   * (its drift is a smaller share of the drop) but leaves less headroom for the ramp. Default 0.15 (common practice: 10-25 %).
   */
  emitterDropFraction: z.number().gt(0, 'the emitter drop fraction must be above 0').lt(0.9, 'the emitter drop fraction must be below 0.9').default(0.15),
  /** Current through the base divider (A). Default: the stiff-divider rule R_TH <= 0.01 beta R_E (Malvino, from memory). */
  dividerCurrentA: rangedNumber(designRanges.dividerCurrentA).optional(),
  alphaMinDeg: z.number().min(0).max(180).default(0),
  alphaMaxDeg: z.number().gt(0).max(180).default(165),
  syncPhaseDeg: z.number().min(-90).max(90).default(0),
  syncResetUs: z.number().min(0).max(5000).default(300),
  gatePulseUs: rangedNumber(designRanges.gatePulseUs).default(200),
  /** Control potentiometer (ohm). Default: the same pot a design without one is taken to have (parts.ts). */
  potControlOhm: rangedNumber(designRanges.resistorOhm).default(defaultControlPotOhm),
  transistor: transistorSchema,
});

export type SizingTargets = z.output<typeof sizingTargetsSchema>;
export type SizingTargetsInput = z.input<typeof sizingTargetsSchema>;
