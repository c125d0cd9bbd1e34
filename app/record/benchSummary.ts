/**
 * A fleet split by the bench that commissioned each unit: how many units each bench did and their mean figures, so
 * a quality reviewer sees at once whether one bench of the line reads apart from the others.
 */
export interface BenchFigures {
  bench: string | null;
  units: number;
  rampPeakMeanV: number | null;
  alphaGainMeanDegPerV: number | null;
}

const mean = (values: number[]): number | null => (values.length === 0 ? null : values.reduce((sum, value) => sum + value, 0) / values.length);

export function benchSummary(members: ReadonlyArray<{ bench: string | null; rampPeakV: number | null; alphaGainDegPerV: number | null }>): BenchFigures[] {
  const byBench = new Map<string | null, Array<{ rampPeakV: number | null; alphaGainDegPerV: number | null }>>();
  for (const member of members) byBench.set(member.bench, [...(byBench.get(member.bench) ?? []), member]);
  return [...byBench.entries()]
    .map(([bench, group]) => ({
      bench,
      units: group.length,
      rampPeakMeanV: mean(group.flatMap((member) => (member.rampPeakV === null ? [] : [member.rampPeakV]))),
      alphaGainMeanDegPerV: mean(group.flatMap((member) => (member.alphaGainDegPerV === null ? [] : [member.alphaGainDegPerV]))),
    }))
    .sort((a, b) => (a.bench ?? '').localeCompare(b.bench ?? ''));
}
