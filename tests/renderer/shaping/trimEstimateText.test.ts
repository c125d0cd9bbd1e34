import { describe, expect, it } from 'vitest';
import { trimEstimateText } from '../../../renderer/shaping/trimEstimateText';

const base = { chargingCurrentA: 506e-6, designCurrentA: 354e-6, ambiguity: '' };

describe('the trim estimate in words', () => {
  it('names an effective V_EB when a junction could be that far off', () => {
    const text = trimEstimateText({ ...base, chargingCurrentA: 360e-6, vebV: 0.612, explanation: 'veb', capacitanceErrorPct: -1.7 });
    expect(text).toContain("V_EB were 612 mV");
    expect(text).toContain('charging current 360 µA (design 354 µA, +2 %)');
    expect(text).toContain('−2 % from its value');
  });

  it('never shows the formal (negative) V_EB when only a part error explains the ramp', () => {
    const text = trimEstimateText({ ...base, vebV: -0.222, explanation: 'capacitance', capacitanceErrorPct: -30 });
    expect(text).not.toMatch(/V_EB were|-222|−222/);
    expect(text).toContain('ramp capacitor about −30 % from its value, or a wrong emitter resistor');
    // 506 / 354 - 1 = +42.9 %, shown to whole percent.
    expect(text).toContain('+43 %');
  });
});
