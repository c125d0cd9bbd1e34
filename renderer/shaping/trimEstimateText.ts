/**
 * The planner's estimate of what the board actually does, in a technician's words. A V_EB is only named when a
 * junction could plausibly be that far off; otherwise the formal V_EB solution (which can come out negative) is
 * not shown and the capacitor or a wrong emitter resistor is named instead. DOM-free.
 */
import type { TrimPlanView } from '../../app/contract/records';
import { formatSi } from './formatSi';

export function trimEstimateText(estimate: NonNullable<TrimPlanView['estimate']>): string {
  const errorPct = (estimate.chargingCurrentA / estimate.designCurrentA - 1) * 100;
  const current = `charging current ${formatSi(estimate.chargingCurrentA, 'A')} (design ${formatSi(estimate.designCurrentA, 'A')}, ${signedPct(errorPct)})`;
  const cause =
    estimate.explanation === 'veb'
      ? `as if the transistor's V_EB were ${formatSi(estimate.vebV, 'V')}, or the ramp capacitor ${signedPct(estimate.capacitanceErrorPct)} from its value`
      : `more than any V_EB error explains: the ramp capacitor about ${signedPct(estimate.capacitanceErrorPct)} from its value, or a wrong emitter resistor`;
  return `Estimate from the ramp: ${current}, ${cause}. The ramp alone cannot tell a current error from a capacitance error.`;
}

function signedPct(value: number): string {
  return `${value >= 0 ? '+' : '−'}${Math.abs(value).toFixed(0)} %`;
}
