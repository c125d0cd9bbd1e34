/**
 * The logger's analog front end (firmware/README.md draws it): one resistor network per input between the test
 * point and the ADC pin, two comparators for the timed edges. The simulated chip reads its pins through these
 * same numbers, and the greeting's gain and offset follow from them (tests check the firmware's greeting).
 *
 * Each input is a test-point resistor into the pin node, with a resistor from the node to the reference (a level
 * shift, for the bipolar sync) and one to ground; node voltage = (Vtp/R1 + Vref/R2) / (1/R1 + 1/R2 + 1/R3).
 */
import type { ChannelRole } from '../../app/logger/protocol';

export interface InputNetwork {
  role: ChannelRole;
  /** ADC input number (ADC0..ADC3), also the scan order. */
  adcChannel: number;
  fromTestPointOhm: number;
  /** Level shift: from the pin node to the reference; null for a plain divider. */
  toReferenceOhm: number | null;
  toGroundOhm: number;
}

export interface Comparator {
  /** Switching level at the test point (V); the output goes high above thresholdV + hysteresisV, low below thresholdV - hysteresisV. */
  thresholdV: number;
  hysteresisV: number;
  /** Port D pin: 2 is INT0, 3 is INT1. */
  portDPin: number;
}

/** External reference on AREF (V). */
export const referenceV = 4.096;
export const adcCodes = 1024;

/** Our values, E96 resistors (1 %). */
export const inputNetworks: readonly InputNetwork[] = [
  { role: 'sync', adcChannel: 0, fromTestPointOhm: 100e3, toReferenceOhm: 20.5e3, toGroundOhm: 25.5e3 },
  { role: 'gate', adcChannel: 1, fromTestPointOhm: 52.3e3, toReferenceOhm: null, toGroundOhm: 10e3 },
  { role: 'ramp', adcChannel: 2, fromTestPointOhm: 52.3e3, toReferenceOhm: null, toGroundOhm: 10e3 },
  { role: 'control', adcChannel: 3, fromTestPointOhm: 52.3e3, toReferenceOhm: null, toGroundOhm: 10e3 },
];

/**
 * The sync comparator compares the sync node with a copy of its network whose test-point end is grounded, so it
 * switches at 0 V on the test point; a 10 MOhm feedback resistor gives it about +-0.5 mV of hysteresis at the node,
 * +-5 mV at the test point. The gate comparator switches at 2 V on the gate test point (well above noise, well
 * below any gate drive), with +-0.1 V of hysteresis.
 */
export const syncComparator: Comparator = { thresholdV: 0, hysteresisV: 0.005, portDPin: 2 };
export const gateComparator: Comparator = { thresholdV: 2, hysteresisV: 0.1, portDPin: 3 };

/** Pin voltage as the fraction of the test point plus the shift: pinV = scale x testPointV + shiftV. */
export function networkTransfer(network: InputNetwork, reference = referenceV): { scale: number; shiftV: number } {
  const fromTestPoint = 1 / network.fromTestPointOhm;
  const toReference = network.toReferenceOhm === null ? 0 : 1 / network.toReferenceOhm;
  const total = fromTestPoint + toReference + 1 / network.toGroundOhm;
  return { scale: fromTestPoint / total, shiftV: (reference * toReference) / total };
}

/** Clamp diodes hold the pin within a Schottky drop of the rails (0.3 V, from memory). */
export function pinVolts(network: InputNetwork, testPointV: number): number {
  const { scale, shiftV } = networkTransfer(network);
  return Math.min(5.3, Math.max(-0.3, scale * testPointV + shiftV));
}

/**
 * Greeting scale: the converter truncates, so code c stands for pin voltages from c to c + 1 codes; its middle,
 * (c + 0.5) codes, is taken back through the network: testPointV = ((c + 0.5) x LSB - shiftV) / scale.
 */
export function greetingScale(network: InputNetwork): { gainV: number; offsetV: number } {
  const { scale, shiftV } = networkTransfer(network);
  const lsbV = referenceV / adcCodes;
  return { gainV: lsbV / scale, offsetV: (0.5 * lsbV - shiftV) / scale };
}
