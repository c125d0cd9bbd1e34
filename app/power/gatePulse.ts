/**
 * How long a gate pulse must last: the thyristor only stays on once its anode current has passed the latching
 * current. With an RL load the current rises as i(t) = (V/R)(1 - e^(-tR/L)), so the minimum width is
 *   t = -(L/R) ln(1 - I_L R / V)
 * (REFERENCES.md, rectifier and gate facts). V is the instantaneous anode voltage at the firing instant.
 */
export interface LatchingLoad {
  latchingCurrentA: number;
  loadOhm: number;
  loadHenry: number;
}

/** Minimum gate pulse width (us) for an RL load fired when the anode voltage is `anodeV`; Infinity if it never latches. */
export function minimumGatePulseUs(load: LatchingLoad, anodeV: number): number {
  const { latchingCurrentA, loadOhm, loadHenry } = load;
  if (anodeV <= 0) return Infinity;
  const steadyCurrentA = anodeV / loadOhm;
  if (steadyCurrentA <= latchingCurrentA) return Infinity;
  if (loadHenry === 0) return 0;
  const timeConstantS = loadHenry / loadOhm;
  return -timeConstantS * Math.log(1 - latchingCurrentA / steadyCurrentA) * 1e6;
}

/** Instantaneous mains voltage at a firing angle: the anode voltage the thyristor sees when it is fired. */
export function anodeVoltageAtAlphaV(mainsRmsV: number, alphaDeg: number): number {
  return Math.SQRT2 * mainsRmsV * Math.sin((alphaDeg * Math.PI) / 180);
}
