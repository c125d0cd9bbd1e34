/**
 * An ngspice deck of a whole firing board, built from a board design: the outside reference for the board model
 * (issue 3) and for the analysis engine (issue 2).
 *
 * Blocks (node names in `nodes`):
 * - sync: a sine at mainsHz lagging the mains by syncPhaseDeg (+ extraSyncPhaseDeg), plus syncOffsetV; t = 0 is a
 *   rising mains zero crossing.
 * - zero-crossing detector -> reset switch: full-wave holds the ramp in reset while |sync| is below the level
 *   it has syncResetUs/2 either side of each crossing; half-wave holds it while sync is below that level on the
 *   positive side, so through the whole negative half-cycle. Both charge for a half-cycle minus syncResetUs.
 *   The switch is a smooth conductance (tanh edges of about 2 us, for convergence) in series with rDischarge.
 * - current source: R1 rBiasTop +V -> base, R2 rBiasBottom base -> 0, RE rEmitter +V -> emitter, a Gummel-Poon PNP
 *   (IS, NF, BF, ISE, NE, IKF, VAF, RB, RE: app/board/transistorLaw.ts gives each value and its source) whose V_EB
 *   and beta are the design's at its own operating point, with VAF = earlyV set explicitly (the SPICE default has no
 *   Early effect, REFERENCES.md), charging cRamp.
 * - comparator ramp vs control (tanh, 5 mV wide), then a differentiator (1 nF, tau = gatePulseUs/ln 2) and a
 *   threshold at half its step: a gate pulse of gatePulseUs between 50 % points, starting at the crossing.
 * The deck runs at 25 C (.temp and tnom) so the junction law matches the model's nominal temperature.
 */
import type { BoardDesign } from '../../app/board/design';
import { boardPartValues, type PartOverrides } from '../../app/board/parts';
import { nominalTemperatureC, transistorLawOf } from '../../app/board/transistorLaw';
import { runTransient } from './ngspice';

export interface FiringBoardDeckOptions {
  /** Control voltage: fixed, or swept linearly from fromV to toV over the whole run. */
  controlV: number | { fromV: number; toV: number };
  /** Mains cycles to simulate. */
  cycles: number;
  /** Peak of the sync test point (V). Default 5 V. */
  syncAmplitudeV?: number;
  /** Sync lag beyond the design's syncPhaseDeg (degrees): a fault or a drifted sync network. */
  extraSyncPhaseDeg?: number;
  /** DC offset on the sync test point (V), seen by the reset detector too: a leaky coupling or unbalanced winding. */
  syncOffsetV?: number;
  /** Parts as actually fitted (a wrong part, a trim applied): ohm, or farad for cRamp. */
  partOverrides?: PartOverrides;
  /** The fitted transistor needs this much more V_EB than the design's at the same current (V). */
  vebShiftV?: number;
  /** Current gain of the fitted transistor, when not the design's. */
  beta?: number;
  /** Height of the gate pulse (V). Default 5 V. */
  gateHighV?: number;
}

export interface FiringBoardNodes {
  sync: string;
  ramp: string;
  gate: string;
  control: string;
  emitter: string;
}

export interface FiringBoardDeck {
  netlist: string;
  nodes: FiringBoardNodes;
  stopS: number;
  /** Print and maximum solver step: at most 5 us and 1/2000 of a cycle. */
  suggestedStepS: number;
}

const nodes: FiringBoardNodes = { sync: 'v(sync)', ramp: 'v(ramp)', gate: 'v(gate)', control: 'v(control)', emitter: 'v(emit)' };

function number(value: number): string {
  return value.toPrecision(10);
}

export function buildFiringBoardDeck(design: BoardDesign, options: FiringBoardDeckOptions): FiringBoardDeck {
  const values = boardPartValues(design, options.partOverrides);
  const law = transistorLawOf(design, { vebShiftV: options.vebShiftV, beta: options.beta });
  const mainsHz = design.mainsHz;
  const stopS = options.cycles / mainsHz;
  const syncAmplitudeV = options.syncAmplitudeV ?? 5;
  const gateHighV = options.gateHighV ?? 5;
  const lagDeg = design.syncPhaseDeg + (options.extraSyncPhaseDeg ?? 0);
  const resetS = design.syncResetUs * 1e-6;
  // The sync level at syncResetUs/2 from a crossing; the detector switches there.
  const thresholdV = syncAmplitudeV * Math.sin(Math.PI * mainsHz * resetS);
  // tanh width giving about 2 us edges at the sync's zero-crossing slew rate.
  const edgeV = syncAmplitudeV * 2 * Math.PI * mainsHz * 2e-6;
  const resetExpression =
    design.rectifier === 'full-wave'
      ? `0.5*(1+tanh((${number(thresholdV)}-abs(v(sync)))/${number(edgeV)}))`
      : `0.5*(1+tanh((${number(thresholdV)}-v(sync))/${number(edgeV)}))`;
  const pulseTauS = (design.gatePulseUs * 1e-6) / Math.LN2;
  const differentiatorFarad = 1e-9;
  const control =
    typeof options.controlV === 'number'
      ? `Vcontrol control 0 DC ${number(options.controlV)}`
      : `Vcontrol control 0 PWL(0 ${number(options.controlV.fromV)} ${number(stopS)} ${number(options.controlV.toV)})`;
  const netlist = [
    `* firing board ${design.name} (${design.rectifier}, ${mainsHz} Hz)`,
    `.temp ${nominalTemperatureC}`,
    `.options tnom=${nominalTemperatureC}`,
    `Vsupply vcc 0 DC ${number(design.supplyV)}`,
    `Bsync sync 0 V=${number(syncAmplitudeV)}*sin(${number(2 * Math.PI * mainsHz)}*time-${number((lagDeg * Math.PI) / 180)})+${number(options.syncOffsetV ?? 0)}`,
    `Breset reset 0 V=${resetExpression}`,
    `R1 vcc base ${number(values.rBiasTopOhm)}`,
    `R2 base 0 ${number(values.rBiasBottomOhm)}`,
    `RE vcc emit ${number(values.rEmitterOhm)}`,
    `Q1 ramp base emit QRAMP`,
    // Gummel-Poon parameters (app/board/transistorLaw.ts names each source): IS and BF calibrated so V_EB and beta are
    // the design's at its operating point; NF, ISE/NE, IKF, RB, RE the small-signal shape; VAF the design's Early
    // voltage, set explicitly (the default has none, REFERENCES.md); BR 1 and NR 1 (reverse region, unused; from memory).
    `.model QRAMP PNP(IS=${number(law.saturationCurrentA)} NF=${number(law.emissionCoefficient)} BF=${number(law.idealBeta)} ISE=${number(law.recombinationCurrentA)} NE=${number(law.recombinationEmission)} IKF=${number(law.kneeCurrentA)} VAF=${number(law.earlyV)} RB=${number(law.baseOhm)} RE=${number(law.emitterOhm)} BR=1 NR=1)`,
    `Cramp ramp 0 ${number(values.cRampFarad)}`,
    `Bdischarge ramp 0 I=v(reset)*v(ramp)/${number(values.rDischargeOhm)}`,
    control,
    `Bcompare cmp 0 V=0.5*(1+tanh((v(ramp)-v(control))/0.005))`,
    `Cdiff cmp diff ${number(differentiatorFarad)}`,
    `Rdiff diff 0 ${number(pulseTauS / differentiatorFarad)}`,
    `Bgate gate 0 V=${number(gateHighV)}*0.5*(1+tanh((v(diff)-0.5)/0.02))`,
  ].join('\n');
  const suggestedStepS = Math.min(5e-6, 1 / mainsHz / 2000);
  return { netlist, nodes, stopS, suggestedStepS };
}

export interface FiringBoardTraces {
  timeS: Float64Array;
  sync: Float64Array;
  ramp: Float64Array;
  gate: Float64Array;
  control: Float64Array;
  emitter: Float64Array;
}

/** Builds the deck and runs it through ngspice (tests/reference/ngspice.ts). `stepS` overrides the print/max step. */
export function simulateFiringBoard(design: BoardDesign, options: FiringBoardDeckOptions & { stepS?: number }): FiringBoardTraces {
  const deck = buildFiringBoardDeck(design, options);
  const stepS = options.stepS ?? deck.suggestedStepS;
  const names = [deck.nodes.sync, deck.nodes.ramp, deck.nodes.gate, deck.nodes.control, deck.nodes.emitter];
  const trace = runTransient(deck.netlist, names, { stepS, stopS: deck.stopS, maxStepS: stepS });
  return {
    timeS: trace.timeS,
    sync: trace.vectors[deck.nodes.sync],
    ramp: trace.vectors[deck.nodes.ramp],
    gate: trace.vectors[deck.nodes.gate],
    control: trace.vectors[deck.nodes.control],
    emitter: trace.vectors[deck.nodes.emitter],
  };
}
