/**
 * Readings against the board's design: one check per reading with the design's value, the tolerance and a verdict.
 * Our rule for the verdict: within 75 % of the tolerance is in tolerance; beyond 75 % but within the tolerance is
 * marginal (a part near its limit, worth a look before sign-off); beyond it is out of tolerance. A limit (alpha max,
 * alpha min) is judged on how far the reading passes it. Expected values come from the design and the board model
 * (app/board: predicted ramp start, firing angle for the measured control voltage).
 */
import type { MeasuredVerdict, Verdict } from '../contract/readings';
import type { BoardDesign } from '../board/design';
import { alphaForControl } from '../board/firingAngle';
import { predictRamp } from '../board/rampModel';
import { anodeVoltageAtAlphaV, minimumGatePulseUs } from '../power/gatePulse';
import type { CaptureReadings } from './readings';

export interface ReadingCheck {
  key: string;
  label: string;
  measured: number | boolean | null;
  expected: number | boolean | null;
  /** Allowed deviation in the reading's unit; 0 for counts that must be exact; null for yes/no checks. */
  toleranceAbs: number | null;
  unit: string;
  /** "not-measured" while the reading has no measurement: a check is never judged on a value it does not have. */
  verdict: Verdict;
  /** One line for the technician (a diagnosis, what the limit is for); never a marker. */
  note: string | null;
  /** The expected value is a limit the reading must stay under ('at-most') or above ('at-least'), not a target. */
  limit?: 'at-most' | 'at-least';
}

/** Fraction of the tolerance beyond which an in-tolerance reading is marginal (our rule). */
export const marginalFraction = 0.75;

/** Mains frequency tolerance: +-1 % (EN 50160 for interconnected systems, from memory). */
const mainsTolerancePct = 1;

/** Gate pulse width tolerance: +-20 % of the design width (our rule: RC pulse stages with 10 % capacitors). */
const pulseWidthTolerancePct = 20;

/**
 * A gate pulse under twice the latching minimum is marginal (our rule: the latching current of a thyristor rises
 * when it is cold and spreads between parts of one type, from memory).
 */
const latchMarginFactor = 2;

export function verdictFor(deviation: number, toleranceAbs: number): MeasuredVerdict {
  const size = Math.abs(deviation);
  if (toleranceAbs <= 0) return size === 0 ? 'in-tolerance' : 'out-of-tolerance';
  if (size > toleranceAbs) return 'out-of-tolerance';
  return size > marginalFraction * toleranceAbs ? 'marginal' : 'in-tolerance';
}

/** A reading against an expected value +- a tolerance (in the reading's unit). */
export function checkAgainst(key: string, label: string, unit: string, measured: number | null, expected: number, toleranceAbs: number, note: string | null = null): ReadingCheck {
  return { key, label, measured, expected, toleranceAbs, unit, verdict: measured === null ? 'not-measured' : verdictFor(measured - expected, toleranceAbs), note };
}

function limit(key: string, label: string, unit: string, measured: number | null, limitValue: number, toleranceAbs: number, side: 'max' | 'min'): ReadingCheck {
  const beyond = measured === null ? 0 : side === 'max' ? Math.max(0, measured - limitValue) : Math.max(0, limitValue - measured);
  // Approaching the limit from inside is fine; passing it is judged by how far.
  return { key, label, measured, expected: limitValue, toleranceAbs, unit, verdict: measured === null ? 'not-measured' : verdictFor(beyond, toleranceAbs), note: null, limit: side === 'max' ? 'at-most' : 'at-least' };
}

export function judgeReadings(readings: CaptureReadings, design: BoardDesign): ReadingCheck[] {
  const checks: ReadingCheck[] = [];
  const prediction = predictRamp(design);
  checks.push(checkAgainst('frequencyHz', 'Mains frequency', 'Hz', readings.frequencyHz, design.mainsHz, (design.mainsHz * mainsTolerancePct) / 100));
  checks.push(checkAgainst('rampPeakV', 'Ramp peak', 'V', readings.ramp.peakV, design.rampTargetV, (design.rampTargetV * design.tolerances.rampPeakPct) / 100));
  const expectedStartDeg = design.syncPhaseDeg + 360 * design.mainsHz * prediction.startDelayS;
  checks.push(checkAgainst('rampStartDelayDeg', 'Ramp start after zero crossing', 'deg', readings.ramp.startDelayDeg, expectedStartDeg, design.tolerances.startDelayDeg));
  checks.push({
    key: 'rampClipped',
    label: 'Ramp clipping',
    measured: readings.ramp.chargingIntervals > 0 ? readings.ramp.clipped : null,
    expected: false,
    toleranceAbs: null,
    unit: '',
    verdict: readings.ramp.chargingIntervals === 0 ? 'not-measured' : readings.ramp.clipped ? 'out-of-tolerance' : 'in-tolerance',
    note: readings.ramp.clippedIntervals > 0 ? `${readings.ramp.clippedIntervals} of ${readings.ramp.chargingIntervals} ramps flatten before the half-cycle ends` : null,
  });
  const alphaToleranceDeg = design.tolerances.alphaDeg;
  if (readings.transfer) {
    // A swept control: the fitted line at both ends of the range against the model there.
    for (const [end, controlV] of [['Low', readings.transfer.controlMinV], ['High', readings.transfer.controlMaxV]] as const) {
      const expected = alphaForControl(design, controlV, { prediction });
      if (expected === null) continue;
      const fitted = readings.transfer.offsetDeg + readings.transfer.gainDegPerV * controlV;
      checks.push(checkAgainst(`alphaAtControl${end}Deg`, `Alpha at ${controlV.toFixed(2)} V control`, 'deg', fitted, expected, alphaToleranceDeg));
    }
  } else if (readings.pulse.controlV !== null) {
    const expected = alphaForControl(design, readings.pulse.controlV, { prediction });
    if (expected !== null) checks.push(checkAgainst('alphaDeg', `Alpha at ${readings.pulse.controlV.toFixed(2)} V control`, 'deg', readings.pulse.alphaDeg, expected, alphaToleranceDeg));
  }
  checks.push(limit('alphaMaxDeg', 'Largest alpha', 'deg', readings.pulse.alphaMaxDeg, design.alphaMaxDeg, alphaToleranceDeg, 'max'));
  checks.push(limit('alphaMinDeg', 'Smallest alpha', 'deg', readings.pulse.alphaMinDeg, design.alphaMinDeg, alphaToleranceDeg, 'min'));
  checks.push(checkAgainst('pulseWidthUs', 'Gate pulse width', 'us', readings.pulse.widthUs, design.gatePulseUs, (design.gatePulseUs * pulseWidthTolerancePct) / 100));
  if (readings.balance) {
    // Both half-cycles of a full-wave board should fire alike (halfCycleBalance.ts): judged with the design's own
    // alpha and ramp-peak tolerances (our rule).
    checks.push(checkAgainst('alphaBalanceDeg', 'Alpha, positive minus negative half-cycle', 'deg', readings.balance.alphaDeg, 0, alphaToleranceDeg, balanceNote(readings.balance.alphaDeg)));
    checks.push(checkAgainst('rampPeakBalanceV', 'Ramp peak, positive minus negative half-cycle', 'V', readings.balance.rampPeakV, 0, (design.rampTargetV * design.tolerances.rampPeakPct) / 100));
  }
  if (design.load) checks.push(latchCheck(readings, design));
  const counted = readings.firingIntervals > 0;
  checks.push(checkAgainst('wrongHalfCyclePulses', 'Pulses in the wrong half-cycle', '', counted ? readings.pulse.wrongHalfCycle : null, 0, 0));
  checks.push(checkAgainst('missingPulses', 'Missing pulses', '', counted ? readings.pulse.missing : null, 0, 0));
  checks.push(checkAgainst('multiplePulses', 'Half-cycles with more than one pulse', '', counted ? readings.pulse.multiplePulses : null, 0, 0));
  return checks;
}

/**
 * Is the gate pulse long enough for the thyristor to latch where it is hardest: at the largest alpha, where the
 * anode voltage is lowest (app/power/gatePulse.ts). The largest alpha measured, or the design's when none was seen.
 */
function latchCheck(readings: CaptureReadings, design: BoardDesign): ReadingCheck {
  const load = design.load;
  if (!load) throw new Error('latchCheck needs a design with a load');
  const alphaDeg = readings.pulse.alphaMaxDeg ?? design.alphaMaxDeg;
  const anodeV = anodeVoltageAtAlphaV(load.mainsRmsV, alphaDeg);
  const minimumUs = minimumGatePulseUs({ latchingCurrentA: load.latchingCurrentA, loadOhm: load.ohm, loadHenry: load.henry }, anodeV);
  const measured = readings.pulse.widthUs;
  const label = `Gate pulse against latching at ${alphaDeg.toFixed(1)} deg`;
  if (!Number.isFinite(minimumUs)) {
    return {
      key: 'pulseLatchUs', label, measured, expected: null, toleranceAbs: null, unit: 'us',
      verdict: measured === null ? 'not-measured' : 'out-of-tolerance',
      note: `at ${alphaDeg.toFixed(1)} deg the anode sees ${anodeV.toFixed(1)} V, so the load current (at most ${((anodeV / load.ohm) * 1000).toFixed(0)} mA) never reaches the ${(load.latchingCurrentA * 1000).toFixed(0)} mA latching current: no pulse width fires it; lower the largest alpha`,
    };
  }
  if (minimumUs === 0) {
    return {
      key: 'pulseLatchUs', label, measured, expected: null, toleranceAbs: null, unit: 'us', verdict: measured === null ? 'not-measured' : 'in-tolerance',
      note: 'a resistive load carries its full current as soon as the gate fires: any pulse that fires it latches it',
    };
  }
  const verdict: Verdict = measured === null ? 'not-measured' : measured < minimumUs ? 'out-of-tolerance' : measured < latchMarginFactor * minimumUs ? 'marginal' : 'in-tolerance';
  return {
    // Tolerance 0 past the limit: the band starts at the minimum (the margin rule above makes "marginal").
    key: 'pulseLatchUs', label, measured, expected: minimumUs, toleranceAbs: 0, unit: 'us', verdict, limit: 'at-least',
    note: `the load current passes the latching current ${minimumUs.toFixed(0)} us after firing; ${latchMarginFactor} times that leaves margin`,
  };
}

/**
 * What an alpha imbalance points to: a DC offset o on a sync of peak A moves the reset asin(o/A) early before one
 * crossing and as much late after the other, so the halves fire 2 asin(o/A) apart (the sine's geometry); the
 * offset that would explain the reading is sin(|balance|/2) of the sync peak.
 */
function balanceNote(alphaDeg: number | null): string | null {
  if (alphaDeg === null || Math.abs(alphaDeg) < 0.5) return null;
  const offsetPct = 100 * Math.sin((Math.abs(alphaDeg) / 2) * (Math.PI / 180));
  const early = alphaDeg < 0 ? 'positive' : 'negative';
  return `the ${early} half-cycle fires early: as a DC offset of ${offsetPct.toFixed(1)} % of the sync peak would (check the sync coupling capacitor, winding and divider)`;
}
