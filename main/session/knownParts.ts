/**
 * What the session knows of the board as built: part values that differ from the design because the technician
 * measured them or fitted a change this session. The trim planner starts from these, so a second plan after a
 * fitted change, or a plan for a board with a wrong part, is made for the board on the bench.
 */
import type { BoardDesign, PartRole } from '../../app/board/design';
import { designValueOf } from '../../app/board/measuredParts';
import type { PartOverrides } from '../../app/board/parts';
import type { KnownPart } from '../../app/contract';

export type KnownPartSource = 'measured' | 'fitted';
export type KnownParts = Partial<Record<PartRole, { value: number; source: KnownPartSource }>>;

/** The technician's measured values replace the earlier measured ones; a fresh measurement also wins over a fitted value. */
export function withMeasured(known: KnownParts, measured: PartOverrides): KnownParts {
  const next: KnownParts = {};
  for (const [role, entry] of Object.entries(known) as [PartRole, { value: number; source: KnownPartSource }][]) {
    if (entry.source === 'fitted') next[role] = entry;
  }
  for (const [role, value] of Object.entries(measured) as [PartRole, number][]) next[role] = { value, source: 'measured' };
  return next;
}

/** Measured values the session has not recorded yet (new, or a different figure), with the design's value beside. */
export function newMeasurements(design: BoardDesign, known: KnownParts, measured: PartOverrides): Array<{ part: PartRole; value: number; designValue: number }> {
  const changes: Array<{ part: PartRole; value: number; designValue: number }> = [];
  for (const [role, value] of Object.entries(measured) as [PartRole, number][]) {
    const before = known[role];
    const designValue = designValueOf(design, role);
    if (designValue === null || (before?.source === 'measured' && before.value === value)) continue;
    changes.push({ part: role, value, designValue });
  }
  return changes;
}

/** A change fitted through the trim plan: the position now holds toOhm. */
export function withFitted(known: KnownParts, part: PartRole, toOhm: number): KnownParts {
  return { ...known, [part]: { value: toOhm, source: 'fitted' } };
}

/** The known values as part overrides: all of them, or only those from one source. */
export function overridesOf(known: KnownParts, source?: KnownPartSource): PartOverrides {
  const overrides: PartOverrides = {};
  for (const [role, entry] of Object.entries(known) as [PartRole, { value: number; source: KnownPartSource }][]) {
    if (source === undefined || entry.source === source) overrides[role] = entry.value;
  }
  return overrides;
}

/** For the screens: each known part beside its design value, in the design's part order. */
export function knownPartViews(design: BoardDesign, known: KnownParts): KnownPart[] {
  const views: KnownPart[] = [];
  for (const role of Object.keys(design.parts) as PartRole[]) {
    const entry = known[role];
    const designValue = designValueOf(design, role);
    if (!entry || designValue === null) continue;
    views.push({ part: role, partRef: design.parts[role]?.ref ?? null, value: entry.value, designValue, source: entry.source });
  }
  return views;
}
