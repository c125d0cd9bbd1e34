/**
 * The virtual board: synthesises the sync, ramp, gate and control test points of a board design, block after
 * block, with measurement noise, ADC quantisation and sampling jitter, and the named board faults. Pure and
 * deterministic for a seed. The ramp itself comes from the board model (app/board/rampModel.ts); this file only
 * places it in time:
 * - sync test point: a sine at the mains frequency lagging the mains by the design's syncPhaseDeg (plus the DC
 *   offset of the sync-offset fault, which the reset detector sees too: resets early before rising crossings and
 *   late after falling ones, so the positive half-cycle charges longer);
 * - ramp: starts startDelayS (half the reset time) after each sync zero crossing and charges for the model's
 *   charging interval; then the reset switch discharges it through the discharge resistor (time constant R C)
 *   until the next start. Half-wave: only the half-cycle after the rising crossing charges; the negative one
 *   stays in reset. Full-wave: every half-cycle;
 * - gate: the comparator fires where the ramp crosses the control voltage (the model's timeToReachV), a pulse of
 *   gatePulseUs; none when the control voltage is at or below the floor or above the peak (as alphaForControl);
 * - control: constant, or a slow triangle sweep (a transfer curve in one capture).
 */
import { sampleBlockLength, type SampleBlock } from '../capture/samples';
import type { BoardDesign, PartRole } from '../board/design';
import { controlForAlpha } from '../board/firingAngle';
import { predictRamp, rampVoltageAt, timeToReachV } from '../board/rampModel';
import { InputError } from '../errors';
import { quantiseVolts, simChannels, type AdcChannel } from './channelScales';
import { isBoardFault, type BoardFaultName, type FaultName } from './faults';
import { fitBoard, type FittedBoard } from './fittedBoard';
import { createSeededRandom, hashedGaussian, hashedUnit } from './random';

export interface ControlSweep {
  fromV: number;
  toV: number;
  /** One full triangle: from, to, back to from (s). */
  periodS: number;
}

export interface VirtualBoardOptions {
  /** Samples per second per channel. Default 25 000. */
  sampleRateHz?: number;
  seed?: number;
  faults?: readonly FaultName[];
  /** Positions where a new part was fitted since the faults were set: part faults no longer apply there. */
  replacedParts?: readonly PartRole[];
  /** Constant control voltage. Default: the voltage that fires the board as designed at 90 degrees. */
  controlV?: number;
  controlSweep?: ControlSweep;
  /** Measurement noise, rms, added to every channel (V). Default 0.005. */
  noiseV?: number;
  /** ADC resolution. Default 12. */
  adcBits?: number;
  /** Rms error of each sampling instant (s). Default 0. */
  samplingJitterS?: number;
  /** Run the board on another mains frequency than it was designed for (Hz). */
  mainsHzOverride?: number;
  /** Sync test point amplitude (V peak). Default 10. */
  syncAmplitudeV?: number;
  /** Mains angle at the first sample (degrees). Default 30, so a capture does not begin exactly on a crossing. */
  startPhaseDeg?: number;
  /** Gate pulse high level (V). Default the board's supply. */
  gateHighV?: number;
}

export interface VirtualBoard {
  readonly fitted: FittedBoard;
  /** The ADC channels in logger order (sync, ramp, gate, control), with their scales. */
  readonly channels: readonly AdcChannel[];
  readonly sampleRateHz: number;
  /** Time of the next sample (s). */
  timeS(): number;
  /** The next `samples` samples of every channel, continuing from the last block. */
  nextBlock(samples: number): SampleBlock;
  /** Control voltage at the board at `timeS` (V). */
  controlAt(timeS: number): number;
  /**
   * The gate pulses' edges in [fromS, toS), in time order: rising at each firing instant, falling gatePulseUs
   * later. These are the exact instants the gate samples are drawn from (a logger's edge input sees them).
   */
  gateEdgesBetween(fromS: number, toS: number): GateEdge[];
}

export interface GateEdge {
  timeS: number;
  rising: boolean;
}

/** Probability that `missing-pulses` skips a firing (our scenario value). */
const missingPulseChance = 0.2;
/** Rms wander of the ramp reset with `noisy-sync` (s), about 1.8 degrees at 50 Hz (our scenario value). */
const noisyResetJitterS = 100e-6;
/** Sync noise with `noisy-sync`, as a fraction of the sync amplitude (rms). */
const noisySyncFraction = 0.05;

function positive(value: number, name: string): number {
  if (!Number.isFinite(value) || value <= 0) throw new InputError(`${name} must be a number above 0 (got ${value})`, name);
  return value;
}

export function createVirtualBoard(design: BoardDesign, options: VirtualBoardOptions = {}): VirtualBoard {
  const sampleRateHz = positive(options.sampleRateHz ?? 25_000, 'sampleRateHz');
  const mainsHz = positive(options.mainsHzOverride ?? design.mainsHz, 'mainsHzOverride');
  const running: BoardDesign = mainsHz === design.mainsHz ? design : { ...design, mainsHz };
  const faults = options.faults ?? [];
  const boardFaults = faults.filter(isBoardFault) as BoardFaultName[];
  const fitted = fitBoard(running, boardFaults, options.replacedParts);
  const prediction = fitted.prediction;
  const seed = options.seed ?? 1;
  const random = createSeededRandom(seed);
  const noiseV = options.noiseV ?? 0.005;
  const jitterS = options.samplingJitterS ?? 0;
  const adcBits = options.adcBits ?? 12;
  if (!Number.isInteger(adcBits) || adcBits < 4 || adcBits > 16) throw new InputError(`adcBits must be a whole number from 4 to 16 (got ${adcBits})`, 'adcBits');
  const syncAmplitudeV = positive(options.syncAmplitudeV ?? 10, 'syncAmplitudeV');
  const gateHighV = positive(options.gateHighV ?? design.supplyV, 'gateHighV');
  const channels = simChannels({ syncAmplitudeV, supplyV: design.supplyV, gateHighV, adcBits });
  const sweep = options.controlSweep;
  if (sweep) positive(sweep.periodS, 'controlSweep.periodS');
  // The default is set on the board as designed, so a part fault shows as a firing angle away from 90 degrees.
  const nominal = predictRamp(running);
  const defaultControlV = controlForAlpha(running, 90, { prediction: nominal }) ?? (nominal.floorV + nominal.peakV) / 2;
  const steadyControlV = options.controlV ?? defaultControlV;

  const halfCycleS = 1 / (2 * mainsHz);
  const startPhaseDeg = options.startPhaseDeg ?? 30;
  const syncAngleOffsetDeg = startPhaseDeg - running.syncPhaseDeg;
  // Sync zero crossing k (k even: rising) at t_k = (180 k - syncAngleOffset) / (360 f).
  const firstCrossingS = -syncAngleOffsetDeg / (360 * mainsHz);
  const rampStartOffsetS = firstCrossingS + fitted.extraSyncLagS + prediction.startDelayS;
  const chargingS = prediction.chargingIntervalS;
  const pulseS = running.gatePulseUs * 1e-6;
  const fullWave = running.rectifier === 'full-wave';
  const wrongHalf = boardFaults.includes('wrong-half-cycle-pulses');
  const missing = boardFaults.includes('missing-pulses');
  const noisySync = boardFaults.includes('noisy-sync');
  const syncNoiseV = noisySync ? noisySyncFraction * syncAmplitudeV : 0;

  function controlAt(timeS: number): number {
    if (!sweep) return steadyControlV;
    const phase = (((timeS / sweep.periodS) % 1) + 1) % 1;
    const triangle = phase < 0.5 ? 2 * phase : 2 - 2 * phase;
    return sweep.fromV + (sweep.toV - sweep.fromV) * triangle;
  }

  // Sync offset: the offset sine crosses zero this long before a rising mains crossing and after a falling one.
  const offsetShiftS = Math.asin(fitted.syncOffsetFraction) / (2 * Math.PI * mainsHz);

  function rampStartS(k: number): number {
    const wander = noisySync ? noisyResetJitterS * Math.max(-3, Math.min(3, hashedGaussian(seed, k, 1))) : 0;
    const offsetShift = (k & 1) === 0 ? -offsetShiftS : offsetShiftS;
    return rampStartOffsetS + k * halfCycleS + wander + offsetShift;
  }

  /** Charging time of half-cycle k: the positive one gains what the offset takes from the negative one. */
  function chargingFor(k: number): number {
    return chargingS + ((k & 1) === 0 ? 2 * offsetShiftS : -2 * offsetShiftS);
  }

  function charges(k: number): boolean {
    return fullWave || wrongHalf || (k & 1) === 0;
  }

  const fireCache = new Map<number, number | null>();
  function fireTimeS(k: number): number | null {
    const cached = fireCache.get(k);
    if (cached !== undefined) return cached;
    let fire: number | null = null;
    if (charges(k) && !(missing && hashedUnit(seed, k, 2) < missingPulseChance)) {
      const startS = rampStartS(k);
      let levelV = controlAt(startS);
      let elapsedS: number | null = null;
      // A sweep moves the control voltage a little during the half-cycle: settle the crossing by iteration.
      for (let pass = 0; pass < (sweep ? 4 : 1); pass++) {
        elapsedS = levelV <= prediction.floorV ? null : timeToReachV(prediction, levelV);
        // A level the ramp reaches only after this half-cycle's reset (a shortened half) does not fire.
        if (elapsedS !== null && elapsedS > chargingFor(k)) elapsedS = null;
        if (elapsedS === null) break;
        levelV = controlAt(startS + elapsedS);
      }
      fire = elapsedS === null ? null : startS + elapsedS;
    }
    if (fireCache.size > 64) fireCache.clear();
    fireCache.set(k, fire);
    return fire;
  }

  function currentHalfCycle(timeS: number): number {
    let k = Math.floor((timeS - rampStartOffsetS) / halfCycleS) + 1;
    while (rampStartS(k) > timeS) k--;
    return k;
  }

  function rampAt(timeS: number, k: number): number {
    const sinceStartS = timeS - rampStartS(k);
    if (charges(k) && sinceStartS <= chargingFor(k)) return rampVoltageAt(prediction, sinceStartS);
    const lastCharging = charges(k) ? k : k - 1;
    const lastChargeS = chargingFor(lastCharging);
    const sinceEndS = timeS - (rampStartS(lastCharging) + lastChargeS);
    const endV = offsetShiftS === 0 ? prediction.peakV : rampVoltageAt(prediction, lastChargeS);
    return fitted.resetSettledV + (endV - fitted.resetSettledV) * Math.exp(-sinceEndS / fitted.dischargeTimeConstantS);
  }

  function gateAt(timeS: number, k: number): number {
    for (let back = 0; back < 3; back++) {
      const fire = fireTimeS(k - back);
      if (fire !== null && timeS >= fire && timeS < fire + pulseS) return gateHighV;
    }
    return 0;
  }

  const syncOmega = 2 * Math.PI * mainsHz;
  const syncPhaseRad = (syncAngleOffsetDeg * Math.PI) / 180;
  let nextSample = 0;
  const [syncAdc, rampAdc, gateAdc, controlAdc] = channels;

  function nextBlock(samples: number): SampleBlock {
    const block: SampleBlock = {
      startS: nextSample / sampleRateHz,
      sampleRateHz,
      sync: new Float64Array(samples),
      ramp: new Float64Array(samples),
      gate: new Float64Array(samples),
      control: new Float64Array(samples),
      afterGap: false,
    };
    for (let index = 0; index < samples; index++) {
      const nominalS = (nextSample + index) / sampleRateHz;
      const timeS = jitterS > 0 ? nominalS + jitterS * random.gaussian() : nominalS;
      const k = currentHalfCycle(timeS);
      const syncV = syncAmplitudeV * (Math.sin(syncOmega * timeS + syncPhaseRad) + fitted.syncOffsetFraction) + syncNoiseV * random.gaussian();
      block.sync[index] = quantiseVolts(syncAdc, syncV + noiseV * random.gaussian());
      block.ramp[index] = quantiseVolts(rampAdc, rampAt(timeS, k) + noiseV * random.gaussian());
      block.gate[index] = quantiseVolts(gateAdc, gateAt(timeS, k) + noiseV * random.gaussian());
      block.control![index] = quantiseVolts(controlAdc, controlAt(timeS) + noiseV * random.gaussian());
    }
    nextSample += sampleBlockLength(block);
    return block;
  }

  function gateEdgesBetween(fromS: number, toS: number): GateEdge[] {
    const edges: GateEdge[] = [];
    for (let k = currentHalfCycle(fromS) - 3; k <= currentHalfCycle(toS); k++) {
      const fire = fireTimeS(k);
      if (fire === null) continue;
      if (fire >= fromS && fire < toS) edges.push({ timeS: fire, rising: true });
      if (fire + pulseS >= fromS && fire + pulseS < toS) edges.push({ timeS: fire + pulseS, rising: false });
    }
    return edges.sort((a, b) => a.timeS - b.timeS);
  }

  return { fitted, channels, sampleRateHz, timeS: () => nextSample / sampleRateHz, nextBlock, controlAt, gateEdgesBetween };
}

/** A whole capture of `durationS`, as consecutive blocks of `blockSamples`. */
export function* synthesiseCapture(design: BoardDesign, options: VirtualBoardOptions & { durationS: number; blockSamples?: number }): Generator<SampleBlock> {
  const board = createVirtualBoard(design, options);
  const total = Math.round(positive(options.durationS, 'durationS') * board.sampleRateHz);
  const blockSamples = options.blockSamples ?? 1000;
  for (let done = 0; done < total; done += blockSamples) yield board.nextBlock(Math.min(blockSamples, total - done));
}
