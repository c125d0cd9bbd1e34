import { describe, expect, it } from 'vitest';
import { anodeVoltageAtAlphaV, minimumGatePulseUs } from '../../../app/power/gatePulse';

describe('minimum gate pulse width for an RL load', () => {
  it('matches the worked example: 100 mA latching, 200 V, 20 ohm, 0.2 H gives 100.5 us', () => {
    // REFERENCES.md, rectifier and gate facts: t = -(L/R) ln(1 - I_L R / V) = 100.5 us.
    expect(minimumGatePulseUs({ latchingCurrentA: 0.1, loadOhm: 20, loadHenry: 0.2 }, 200)).toBeCloseTo(100.5, 1);
  });

  it('is zero for a resistive load and infinite when the load can never reach the latching current', () => {
    expect(minimumGatePulseUs({ latchingCurrentA: 0.1, loadOhm: 20, loadHenry: 0 }, 200)).toBe(0);
    expect(minimumGatePulseUs({ latchingCurrentA: 0.1, loadOhm: 20, loadHenry: 0.2 }, 1.5)).toBe(Infinity);
    expect(minimumGatePulseUs({ latchingCurrentA: 0.1, loadOhm: 20, loadHenry: 0.2 }, 0)).toBe(Infinity);
  });

  it('grows with the load time constant (first-order current rise)', () => {
    const short = minimumGatePulseUs({ latchingCurrentA: 0.1, loadOhm: 20, loadHenry: 0.05 }, 200);
    const long = minimumGatePulseUs({ latchingCurrentA: 0.1, loadOhm: 20, loadHenry: 0.4 }, 200);
    expect(long / short).toBeCloseTo(8, 6);
  });

  it('uses the instantaneous mains voltage at the firing angle', () => {
    // 230 V rms mains peaks at 325.27 V (REFERENCES.md); at 30 degrees the anode sees half of that.
    expect(anodeVoltageAtAlphaV(230, 90)).toBeCloseTo(325.27, 2);
    expect(anodeVoltageAtAlphaV(230, 30)).toBeCloseTo(162.635, 2);
  });
});
