/**
 * DC operating point of the divider-biased PNP current source at a given collector (ramp) voltage.
 *
 * Circuit (REFERENCES.md: Malvino, divider-biased emitter current): R1 (rBiasTop) +V -> base, R2 (rBiasBottom)
 * base -> 0 V, RE (rEmitter) +V -> emitter, collector into the ramp capacitor. With V_EB held fixed this gives
 *   I_E = (V - V_TH - V_EB) / (R_E + R_TH/(beta+1)),  V_TH = V R2/(R1+R2),  R_TH = R1 R2/(R1+R2).
 * Here V_EB follows the transistor's exponential law instead (I_be = I_S (exp(V_EB/V_T) - 1), as in the
 * Gummel-Poon model SPICE uses, from memory), and the Early effect raises the collector current with V_EC:
 *   I_C = I_be (1 + V_EC/V_A), I_B = I_be/beta, which is r_o = (V_A + V_EC)/I_C (REFERENCES.md: Early effect).
 */

export interface BiasNetwork {
  supplyV: number;
  rEmitterOhm: number;
  rBiasTopOhm: number;
  rBiasBottomOhm: number;
}

export interface TransistorLaw {
  /** Saturation current I_S of the emitter-base junction (A). */
  saturationCurrentA: number;
  /** Forward current gain beta (I_be / I_B). */
  beta: number;
  earlyV: number;
  /** Thermal voltage kT/q (V). */
  thermalV: number;
}

export interface OperatingPoint {
  emitterV: number;
  baseV: number;
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

function pointAt(bias: BiasNetwork, law: TransistorLaw, collectorV: number, beCurrentA: number): OperatingPoint & { residualV: number } {
  const { theveninV, theveninOhm } = theveninOf(bias);
  const baseCurrentA = beCurrentA / law.beta;
  // Base current leaves a PNP's base and flows into the divider's Thevenin source, raising the base.
  const baseV = theveninV + baseCurrentA * theveninOhm;
  const vebV = beCurrentA > 0 ? law.thermalV * Math.log1p(beCurrentA / law.saturationCurrentA) : 0;
  const emitterV = baseV + vebV;
  const collectorCurrentA = beCurrentA * (1 + Math.max(0, emitterV - collectorV) / law.earlyV);
  const emitterCurrentA = collectorCurrentA + baseCurrentA;
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
  let high = Math.max(bias.supplyV / bias.rEmitterOhm, 1e-15);
  if (pointAt(bias, law, collectorV, 0).residualV <= 0) {
    const off = pointAt(bias, law, collectorV, 0);
    return { ...stripResidual(off), collectorCurrentA: 0, emitterCurrentA: 0 };
  }
  const vebGuessV = law.thermalV * Math.log1p(Math.max(bias.supplyV / bias.rEmitterOhm / 100, 1e-12) / law.saturationCurrentA);
  let current = Math.min(Math.max(malvinoEmitterCurrentA(bias, vebGuessV, law.beta) * (law.beta / (law.beta + 1)), high * 1e-9), high * 0.999);
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

/**
 * The saturation current that makes V_EB equal `vebV` at the design's own operating point with the ramp at 0 V.
 * The design states V_EB as a single number; this turns it into a transistor law, so a changed resistor moves
 * V_EB by V_T ln(I'/I) as a real junction does (and the reference deck uses the same transistor).
 */
export function saturationCurrentFor(bias: BiasNetwork, vebV: number, beta: number, earlyV: number, thermalV: number): number {
  const { theveninV, theveninOhm } = theveninOf(bias);
  // With V_EB fixed the balance is linear in I_be apart from the small Early term: bisection again.
  const residual = (beCurrentA: number): number => {
    const emitterV = theveninV + (beCurrentA / beta) * theveninOhm + vebV;
    const emitterCurrentA = beCurrentA * (1 + emitterV / earlyV) + beCurrentA / beta;
    return bias.supplyV - emitterV - emitterCurrentA * bias.rEmitterOhm;
  };
  let low = 0;
  let high = bias.supplyV / bias.rEmitterOhm;
  for (let iteration = 0; iteration < 200 && high - low > high * 1e-15; iteration += 1) {
    const middle = 0.5 * (low + high);
    if (residual(middle) > 0) low = middle;
    else high = middle;
  }
  const beCurrentA = 0.5 * (low + high);
  return beCurrentA / Math.expm1(vebV / thermalV);
}
