/**
 * Part values of a design as the model and the reference decks use them: the stored value, or an override
 * (a wrong part fitted, a trim applied). Defaults for optional parts are documented here, once.
 */
import type { BoardDesign, PartRole } from './design';

/** Part values that replace the stored ones (ohm for resistors, farad for the capacitor). */
export type PartOverrides = Partial<Record<PartRole, number>>;

/**
 * Discharge resistance in series with the reset switch when the design names none: a few ohms to tens of ohms
 * limit the switch's peak current (common practice); 22 ohm is our own middle choice, well inside that range.
 */
export const defaultDischargeOhm = 22;

/**
 * Control potentiometer when the design names none: 1k to 100k linear pots are all usual for a control divider
 * (common practice); 10k is our own choice, light on the control supply and stiff enough for a comparator input.
 */
export const defaultControlPotOhm = 10000;

export interface BoardPartValues {
  rEmitterOhm: number;
  rBiasTopOhm: number;
  rBiasBottomOhm: number;
  cRampFarad: number;
  rDischargeOhm: number;
  /** Null when the board has no fixed control-limit resistor (the pot spans the whole supply). */
  rControlTopOhm: number | null;
  potControlOhm: number;
}

export function boardPartValues(design: BoardDesign, overrides: PartOverrides = {}): BoardPartValues {
  const parts = design.parts;
  return {
    rEmitterOhm: overrides.rEmitter ?? parts.rEmitter.ohm,
    rBiasTopOhm: overrides.rBiasTop ?? parts.rBiasTop.ohm,
    rBiasBottomOhm: overrides.rBiasBottom ?? parts.rBiasBottom.ohm,
    cRampFarad: overrides.cRamp ?? parts.cRamp.farad,
    rDischargeOhm: overrides.rDischarge ?? parts.rDischarge?.ohm ?? defaultDischargeOhm,
    rControlTopOhm: overrides.rControlTop ?? parts.rControlTop?.ohm ?? null,
    potControlOhm: overrides.potControl ?? parts.potControl?.ohm ?? defaultControlPotOhm,
  };
}

/** The board's own designator for a part, shown beside its role ("rEmitter (R7)"). */
export function partLabel(design: BoardDesign, role: PartRole): string {
  const ref = design.parts[role]?.ref;
  return ref ? `${role} (${ref})` : role;
}
