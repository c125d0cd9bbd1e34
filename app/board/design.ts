/**
 * The stored design of a board type (`*.board.json`, our own schema). Validated at the edge with zod;
 * the core trusts a parsed `BoardDesign`. Physics checks (a divider that cuts the transistor off,
 * a target above the supply) live in `validateBoardPhysics` beside the model. Every number is held to a physical
 * range (designRanges.ts, with the source of each range), so no value can drive the model to NaN or infinity.
 */
import { z } from 'zod';
import { channelMapSchema } from '../capture/channelMap';
import { designRanges, rangedNumber } from './designRanges';

const resistor = z.object({
  ohm: rangedNumber(designRanges.resistorOhm),
  tolerancePct: z.number().min(0).max(50).default(5),
  ref: z.string().max(40, 'a designator has at most 40 characters').optional(),
});

const capacitor = z.object({
  farad: rangedNumber(designRanges.rampCapacitorFarad),
  tolerancePct: z.number().min(0).max(80).default(10),
  ref: z.string().max(40, 'a designator has at most 40 characters').optional(),
});

/** The current-source transistor; every field defaults. */
export const transistorSchema = z
  .object({
    // Typical small-signal PNP values, from memory (REFERENCES.md: V_EB 0.6-0.7 V, beta 100-300, V_A 20-100 V).
    vebV: z.number().min(0.3).max(1.0).default(0.65),
    beta: z.number().min(10).max(2000).default(150),
    earlyV: rangedNumber(designRanges.earlyV).default(60),
    vecSatV: z.number().min(0).max(2).default(0.2),
  })
  .default({ vebV: 0.65, beta: 150, earlyV: 60, vecSatV: 0.2 });

/**
 * The power stage the board fires, when the design names it: the mains the thyristor sees, the load and the
 * thyristor's latching current. With it the Limits step judges whether the gate pulse is long enough to latch at
 * the largest alpha (app/power/gatePulse.ts) and states the load voltage range (app/power/rectifierOutput.ts).
 */
export const loadSchema = z.object({
  /** Mains at the thyristor's anode, rms (V). */
  mainsRmsV: rangedNumber(designRanges.loadMainsRmsV),
  /** Load resistance (ohm). */
  ohm: rangedNumber(designRanges.loadOhm),
  /** Load inductance (H); 0 for a resistive load. */
  henry: z.number().min(0, 'the load inductance cannot be negative').max(100).default(0),
  /** Latching current of the thyristor from its data sheet (A). */
  latchingCurrentA: rangedNumber(designRanges.latchingCurrentA),
});
export type PowerLoad = z.output<typeof loadSchema>;

export const boardDesignSchema = z.object({
  name: z.string().min(1, 'a board design needs a name').max(200, 'a board design name has at most 200 characters'),
  mainsHz: z.number().min(45, 'mains frequency must be 45-65 Hz').max(65, 'mains frequency must be 45-65 Hz'),
  rectifier: z.enum(['half-wave', 'full-wave']),
  /** Supply of the current source (V), emitter resistor side. */
  supplyV: rangedNumber(designRanges.supplyV),
  /** Ramp height wanted at the end of the charging interval (V). */
  rampTargetV: rangedNumber(designRanges.rampTargetV),
  alphaMinDeg: z.number().min(0).max(180).default(0),
  alphaMaxDeg: z.number().gt(0).max(180),
  /** Phase shift of the sync transformer/filter; readings are corrected by it (degrees, lag positive). */
  syncPhaseDeg: z.number().min(-90).max(90).default(0),
  /** How long the sync circuit holds the ramp capacitor in reset around each zero crossing (us). */
  syncResetUs: z.number().min(0).max(5000).default(300),
  /** Width of the gate pulse the board's pulse stage makes (us). Hard firing uses tens to hundreds of us (from memory). */
  gatePulseUs: rangedNumber(designRanges.gatePulseUs).default(200),
  /** Supply of the control divider (rControlTop + potControl), when it is not supplyV (V). */
  controlSupplyV: rangedNumber(designRanges.controlSupplyV).optional(),
  /** Ambient range the board must work over (C), for the tolerance analysis. Default 0-50 C (common practice for indoor gear). */
  ambientC: z
    .object({ minC: z.number().min(-55).max(125), maxC: z.number().min(-55).max(125) })
    .refine((range) => range.minC <= range.maxC, 'ambientC.minC must not be above ambientC.maxC')
    .default({ minC: 0, maxC: 50 }),
  parts: z.object({
    rEmitter: resistor,
    rBiasTop: resistor,
    rBiasBottom: resistor,
    cRamp: capacitor,
    rDischarge: resistor.optional(),
    rControlTop: resistor.optional(),
    potControl: resistor.optional(),
  }),
  transistor: transistorSchema,
  load: loadSchema.optional(),
  tolerances: z
    .object({
      rampPeakPct: rangedNumber(designRanges.rampPeakTolerancePct).default(3),
      alphaDeg: rangedNumber(designRanges.angleToleranceDeg).default(2),
      startDelayDeg: rangedNumber(designRanges.angleToleranceDeg).default(3),
    })
    .default({ rampPeakPct: 3, alphaDeg: 2, startDelayDeg: 3 }),
  /**
   * How this bench's capture files are wired, when they do not name their channels sync, ramp, gate, control
   * (app/capture/channelMap.ts): used when it fits a file, overridden by a map given with the file.
   */
  channelMap: channelMapSchema.optional(),
});

export type BoardDesign = z.output<typeof boardDesignSchema>;
export type BoardDesignInput = z.input<typeof boardDesignSchema>;
export type PartRole = keyof BoardDesign['parts'];
