/**
 * DC operating point of the divider-biased PNP current source at a given collector (ramp) voltage.
 *
 * Circuit (REFERENCES.md: Malvino, divider-biased emitter current): R1 (rBiasTop) +V -> base, R2 (rBiasBottom)
 * base -> 0 V, RE (rEmitter) +V -> emitter, collector into the ramp capacitor. With V_EB held fixed this gives
 *   I_E = (V - V_TH - V_EB) / (R_E + R_TH/(beta+1)),  V_TH = V R2/(R1+R2),  R_TH = R1 R2/(R1+R2).
 * Here the transistor follows the static Gummel-Poon equations SPICE uses (from memory of the SPICE2 model; the
 * reference decks run the same model in ngspice), so V_EB, beta and the Early effect move with the current:
 *   I_be = IS (exp(V_EB/(NF V_T)) - 1)                       the junction's diode law
 *   I_B  = I_be/BF + ISE (exp(V_EB/(NE V_T)) - 1)            ideal plus recombination base current: beta falls at low current
 *   I_C  = I_be / q_b,  1/q_1 = 1 + V_BC/VAF,  q_b = q_1 (1 + sqrt(1 + 4 I_be/IKF))/2
 *                                                            Early effect on the reverse-biased collector junction, high injection
 * with the ohmic base and emitter resistances RB and RE in series with the junction.
 */

export interface BiasNetwork {
  supplyV: number;
  rEmitterOhm: number;
  rBiasTopOhm: number;
  rBiasBottomOhm: number;
}

/** Gummel-Poon parameters of the ramp transistor (SPICE names in brackets). */
export interface TransistorLaw {
  /** Saturation current of the emitter-base junction, IS (A). */
  saturationCurrentA: number;
  /** Forward emission coefficient, NF. */
  emissionCoefficient: number;
  /** Ideal forward current gain, BF: I_be over the ideal part of the base current. */
  idealBeta: number;
  /** Base-emitter recombination saturation current, ISE (A). */
  recombinationCurrentA: number;
  /** Its emission coefficient, NE. */
  recombinationEmission: number;
  /** Forward knee current of high injection, IKF (A). */
  kneeCurrentA: number;
  /** Forward Early voltage, VAF (V). */
  earlyV: number;
  /** Ohmic base resistance, RB (ohm). */
  baseOhm: number;
  /** Ohmic emitter resistance, RE (ohm). */
  emitterOhm: number;
  /** Thermal voltage kT/q (V). */
  thermalV: number;
}

export interface OperatingPoint {
  /** Emitter terminal (V). */
  emitterV: number;
  /** Base terminal (V). */
  baseV: number;
  /** Junction voltage V_EB, without the ohmic drops (V). */
  vebV: number;
  collectorCurrentA: number;
  baseCurrentA: number;
  emitterCurrentA: number;
}

const boltzmannJPerK = 1.380649e-23;
const electronChargeC = 1.602176634e-19;

/** kT/q at a temperature in degrees Celsius (SI 2019 exact constants). 27 C gives 25.865 mV, SPICE's default temperature. */
export function thermalVoltageAt(temperatureC: number): number {
  return (boltzmannJPerK * (temperatureC + 273.15)) / electronChargeC;
}

export function theveninOf(bias: BiasNetwork): { theveninV: number; theveninOhm: number } {
  const total = bias.rBiasTopOhm + bias.rBiasBottomOhm;
  return { theveninV: (bias.supplyV * bias.rBiasBottomOhm) / total, theveninOhm: (bias.rBiasTopOhm * bias.rBiasBottomOhm) / total };
}

/**
 * Malvino's closed form with V_EB fixed and no Early effect (REFERENCES.md). Hand check: V 15, R1 22k, R2 100k,
 * RE 7.5k, V_EB 0.65, beta 150: V_TH 12.2951 V, R_TH 18.033 kohm, I_E = 2.0549/(7500+119.43) = 269.70 uA.
 */
export function malvinoEmitterCurrentA(bias: BiasNetwork, vebV: number, beta: number): number {
  const { theveninV, theveninOhm } = theveninOf(bias);
  return (bias.supplyV - theveninV - vebV) / (bias.rEmitterOhm + theveninOhm / (beta + 1));
}

/** 2/(1 + sqrt(1 + 4 I_be/IKF)): the high-injection share of q_b (1 well below the knee). */
function highInjectionFactor(law: TransistorLaw, beCurrentA: number): number {
  return 2 / (1 + Math.sqrt(1 + (4 * Math.max(beCurrentA, 0)) / law.kneeCurrentA));
}

function pointAt(bias: BiasNetwork, law: TransistorLaw, collectorV: number, beCurrentA: number): OperatingPoint & { residualV: number } {
  const { theveninV, theveninOhm } = theveninOf(bias);
  const vebV = beCurrentA > 0 ? law.emissionCoefficient * law.thermalV * Math.log1p(beCurrentA / law.saturationCurrentA) : 0;
  const recombinationA = law.recombinationCurrentA * Math.expm1(vebV / (law.recombinationEmission * law.thermalV));
  const baseCurrentA = beCurrentA / law.idealBeta + recombinationA;
  // Base current leaves a PNP's base and flows into the divider's Thevenin source, raising the base.
  const baseV = theveninV + baseCurrentA * theveninOhm;
  const innerBaseV = baseV + baseCurrentA * law.baseOhm;
  const collectorCurrentA = beCurrentA * (1 + (innerBaseV - collectorV) / law.earlyV) * highInjectionFactor(law, beCurrentA);
  const emitterCurrentA = collectorCurrentA + baseCurrentA;
  const emitterV = innerBaseV + vebV + emitterCurrentA * law.emitterOhm;
  const residualV = bias.supplyV - emitterV - emitterCurrentA * bias.rEmitterOhm;
  return { emitterV, baseV, vebV, collectorCurrentA, baseCurrentA, emitterCurrentA, residualV };
}

/**
 * Solves the operating point with the collector held at `collectorV` (active region assumed: the caller keeps
 * the ramp below the clipping level). The residual falls monotonically with the junction current, so a Newton
 * step kept inside a shrinking bracket (bisection when a step would leave it) converges from Malvino's estimate
 * in a handful of iterations and can never diverge.
 */
export function solveOperatingPoint(bias: BiasNetwork, law: TransistorLaw, collectorV: number): OperatingPoint {
  let low = 0;
  // Above the knee I_C grows only as sqrt(I_be IKF): the junction current may exceed V/R_E by 4 (V/R_E)/IKF times.
  const mostEmitterA = Math.max(bias.supplyV / bias.rEmitterOhm, 1e-15);
  let high = 2 * mostEmitterA * (1 + (4 * mostEmitterA) / law.kneeCurrentA);
  if (pointAt(bias, law, collectorV, 0).residualV <= 0) {
    const off = pointAt(bias, law, collectorV, 0);
    return { ...stripResidual(off), collectorCurrentA: 0, emitterCurrentA: 0 };
  }
  const vebGuessV = law.emissionCoefficient * law.thermalV * Math.log1p(Math.max(bias.supplyV / bias.rEmitterOhm / 100, 1e-12) / law.saturationCurrentA);
  let current = Math.min(Math.max(malvinoEmitterCurrentA(bias, vebGuessV, law.idealBeta) * (law.idealBeta / (law.idealBeta + 1)), high * 1e-9), high * 0.999);
  for (let iteration = 0; iteration < 200; iteration += 1) {
    const residual = pointAt(bias, law, collectorV, current).residualV;
    // A femtovolt of KCL imbalance per volt of supply is double precision's floor here.
    if (Math.abs(residual) <= bias.supplyV * 1e-15) break;
    if (residual > 0) low = current;
    else high = current;
    const delta = current * 1e-7;
    const slope = (pointAt(bias, law, collectorV, current + delta).residualV - residual) / delta;
    let next = slope < 0 ? current - residual / slope : Number.NaN;
    if (!(next > low && next < high)) next = 0.5 * (low + high);
    if (Math.abs(next - current) <= current * 1e-13 || high - low <= high * 1e-15) {
      current = next;
      break;
    }
    current = next;
  }
  return stripResidual(pointAt(bias, law, collectorV, current));
}

function stripResidual(point: OperatingPoint & { residualV: number }): OperatingPoint {
  return {
    emitterV: point.emitterV,
    baseV: point.baseV,
    vebV: point.vebV,
    collectorCurrentA: point.collectorCurrentA,
    baseCurrentA: point.baseCurrentA,
    emitterCurrentA: point.emitterCurrentA,
  };
}

/** What a design states about its transistor, at its own operating point (ramp at 0 V). */
export interface StatedTransistor {
  vebV: number;
  /** I_C / I_B there, everything included. */
  beta: number;
  earlyV: number;
}

/** The parts of the law a design does not state: typical of small-signal transistors (transistorLaw.ts says where from). */
export interface TransistorShape {
  emissionCoefficient: number;
  recombinationEmission: number;
  /** Share of the base current that is recombination current at the design's operating point (0..1). */
  recombinationShare: number;
  kneeCurrentA: number;
  baseOhm: number;
  emitterOhm: number;
}

/**
 * The law whose junction voltage is `vebV` and whose current gain is `beta` at the design's own operating point
 * with the ramp at 0 V. There the current follows in closed form (V_EB and beta given):
 *   I_C = (V - V_TH - V_EB) / ((R_TH + RB)/beta + (1 + 1/beta)(R_E + RE)),
 * then I_be from the Early and high-injection factors (a few fixed-point passes), IS from the diode law, and the
 * base current split between BF and ISE by the recombination share.
 */
export function calibrateTransistorLaw(bias: BiasNetwork, stated: StatedTransistor, shape: TransistorShape, thermalV: number): TransistorLaw {
  const { theveninV, theveninOhm } = theveninOf(bias);
  const { vebV, beta, earlyV } = stated;
  const collectorA = Math.max(
    (bias.supplyV - theveninV - vebV) / ((theveninOhm + shape.baseOhm) / beta + (1 + 1 / beta) * (bias.rEmitterOhm + shape.emitterOhm)),
    // A design that cuts the transistor off still gets a law (validateBoardPhysics reports the design).
    1e-12,
  );
  const baseA = collectorA / beta;
  const innerBaseV = theveninV + baseA * (theveninOhm + shape.baseOhm);
  const earlyFactor = 1 + innerBaseV / earlyV;
  let beA = collectorA / earlyFactor;
  for (let pass = 0; pass < 20; pass += 1) {
    beA = collectorA / (earlyFactor * (2 / (1 + Math.sqrt(1 + (4 * beA) / shape.kneeCurrentA))));
  }
  return {
    saturationCurrentA: beA / Math.expm1(vebV / (shape.emissionCoefficient * thermalV)),
    emissionCoefficient: shape.emissionCoefficient,
    idealBeta: beA / ((1 - shape.recombinationShare) * baseA),
    recombinationCurrentA: (shape.recombinationShare * baseA) / Math.expm1(vebV / (shape.recombinationEmission * thermalV)),
    recombinationEmission: shape.recombinationEmission,
    kneeCurrentA: shape.kneeCurrentA,
    earlyV,
    baseOhm: shape.baseOhm,
    emitterOhm: shape.emitterOhm,
    thermalV,
  };
}
