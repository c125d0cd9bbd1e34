/**
 * The Board screen's form as data: which fields, their labels and units, reading and writing them by path in a
 * design object, and the problems as typed, field by field (schema first, then the board physics).
 * DOM-free for unit tests.
 */
import { boardDesignSchema, type BoardDesign } from '../../app/board/design';
import { validateBoardPhysics } from '../../app/board/boardPhysics';

export interface DesignField {
  /** Dotted path in the design file, e.g. `parts.rEmitter.ohm`. */
  path: string;
  label: string;
  /** Unit the number is typed in; `kind` says how it is stored. */
  unit: string;
  kind: 'number' | 'text' | 'choice';
  choices?: readonly string[];
  optional?: boolean;
}

export interface DesignFieldGroup {
  title: string;
  fields: readonly DesignField[];
}

const resistor = (role: string, label: string, optional = false): DesignField[] => [
  { path: `parts.${role}.ohm`, label: `${label} (Ω)`, unit: 'ohm', kind: 'number', optional },
  { path: `parts.${role}.ref`, label: `${label}, ref`, unit: '', kind: 'text', optional: true },
];

export const designFieldGroups: readonly DesignFieldGroup[] = [
  {
    title: 'Board',
    fields: [
      { path: 'name', label: 'Design name', unit: '', kind: 'text' },
      { path: 'mainsHz', label: 'Mains (Hz)', unit: 'Hz', kind: 'number' },
      { path: 'rectifier', label: 'Rectifier', unit: '', kind: 'choice', choices: ['half-wave', 'full-wave'] },
      { path: 'supplyV', label: 'Source supply (V)', unit: 'V', kind: 'number' },
      { path: 'rampTargetV', label: 'Ramp target (V)', unit: 'V', kind: 'number' },
      { path: 'alphaMinDeg', label: 'α min (°)', unit: 'deg', kind: 'number', optional: true },
      { path: 'alphaMaxDeg', label: 'α max (°)', unit: 'deg', kind: 'number' },
      { path: 'syncPhaseDeg', label: 'Sync phase (°)', unit: 'deg', kind: 'number', optional: true },
      { path: 'syncResetUs', label: 'Reset time (µs)', unit: 'us', kind: 'number', optional: true },
      { path: 'gatePulseUs', label: 'Gate pulse (µs)', unit: 'us', kind: 'number', optional: true },
    ],
  },
  {
    title: 'Current source and ramp',
    fields: [
      ...resistor('rEmitter', 'Emitter resistor'),
      ...resistor('rBiasTop', 'Bias divider, top'),
      ...resistor('rBiasBottom', 'Bias divider, bottom'),
      { path: 'parts.cRamp.farad', label: 'Ramp capacitor (µF)', unit: 'uF', kind: 'number' },
      { path: 'parts.cRamp.ref', label: 'Ramp capacitor, ref', unit: '', kind: 'text', optional: true },
      ...resistor('rDischarge', 'Discharge resistor', true),
    ],
  },
  {
    title: 'Control divider',
    fields: [...resistor('rControlTop', 'Control limit resistor', true), ...resistor('potControl', 'Control potentiometer', true)],
  },
  {
    title: 'Transistor',
    fields: [
      { path: 'transistor.vebV', label: 'V_EB (V)', unit: 'V', kind: 'number', optional: true },
      { path: 'transistor.beta', label: 'Current gain β', unit: '', kind: 'number', optional: true },
      { path: 'transistor.earlyV', label: 'Early voltage (V)', unit: 'V', kind: 'number', optional: true },
    ],
  },
  {
    title: 'Power stage (optional: for the latching check)',
    fields: [
      { path: 'load.mainsRmsV', label: 'Mains at the anode (V rms)', unit: 'V', kind: 'number', optional: true },
      { path: 'load.ohm', label: 'Load resistance (Ω)', unit: 'ohm', kind: 'number', optional: true },
      { path: 'load.henry', label: 'Load inductance (mH)', unit: 'mH', kind: 'number', optional: true },
      { path: 'load.latchingCurrentA', label: 'Latching current (mA)', unit: 'mA', kind: 'number', optional: true },
    ],
  },
  {
    title: 'Tolerances',
    fields: [
      { path: 'tolerances.rampPeakPct', label: 'Ramp peak (%)', unit: '%', kind: 'number', optional: true },
      { path: 'tolerances.alphaDeg', label: 'Firing angle (°)', unit: 'deg', kind: 'number', optional: true },
      { path: 'tolerances.startDelayDeg', label: 'Ramp start (°)', unit: 'deg', kind: 'number', optional: true },
    ],
  },
];

/**
 * Typed in microfarads, stored in farads: a technician reads "0.47" off the part, not "4.7e-7". Likewise
 * millihenry and milliampere, as data sheets and load plates give them.
 */
const typedScale: Record<string, number> = { uF: 1e-6, mH: 1e-3, mA: 1e-3 };

export function fieldValueText(design: unknown, field: DesignField): string {
  const value = getPath(design, field.path);
  if (value === undefined || value === null) return '';
  if (typeof value === 'number') {
    const scale = typedScale[field.unit] ?? 1;
    return String(Number((value / scale).toPrecision(12)));
  }
  return String(value);
}

/**
 * Write a typed text into a design object (a plain copy being edited). Empty optional fields are removed;
 * text that is not a number is kept as text so the schema names the field and says what is wrong.
 */
export function setFieldText(design: Record<string, unknown>, field: DesignField, text: string): void {
  const trimmed = text.trim();
  if (trimmed === '' && field.optional) return deletePath(design, field.path);
  if (field.kind !== 'number') return setPath(design, field.path, trimmed);
  const number = Number(trimmed.replace(',', '.'));
  setPath(design, field.path, trimmed !== '' && Number.isFinite(number) ? number * (typedScale[field.unit] ?? 1) : trimmed);
}

export interface DesignCheck {
  design: BoardDesign | null;
  /** Problems by field path; errors stop a save, warnings are shown beside the field. */
  problems: Map<string, { severity: 'error' | 'warning'; message: string }>;
}

/** What a number field says of a text that is no number (`1p`, `4k7`): the unit is the label's, no prefixes. */
function notANumber(text: string, path: string): string {
  const field = designFieldGroups.flatMap((group) => group.fields).find((candidate) => candidate.path === path);
  const unit = field ? /\(([^)]+)\)$/.exec(field.label)?.[1] : undefined;
  return `"${text}" is not a number: type digits only${unit ? `, in ${unit} as the label says` : ''} (no unit letters or prefixes)`;
}

export function checkDesign(input: unknown): DesignCheck {
  const problems: DesignCheck['problems'] = new Map();
  const parsed = boardDesignSchema.safeParse(input);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const path = issue.path.map(String).join('.');
      const typed = getPath(input, path);
      const message = issue.code === 'invalid_type' && issue.expected === 'number' && typeof typed === 'string' ? notANumber(typed, path) : issue.message;
      if (!problems.has(path)) problems.set(path, { severity: 'error', message });
    }
    return { design: null, problems };
  }
  for (const problem of validateBoardPhysics(parsed.data)) {
    if (!problems.has(problem.field) || problem.severity === 'error') problems.set(problem.field, { severity: problem.severity, message: problem.message });
  }
  return { design: parsed.data, problems };
}

/** A problem reported against a parent path (`parts.rEmitter`) belongs to its first field (`parts.rEmitter.ohm`). */
export function problemForField(problems: DesignCheck['problems'], field: DesignField): { severity: 'error' | 'warning'; message: string } | null {
  const direct = problems.get(field.path);
  if (direct) return direct;
  const parent = field.path.split('.').slice(0, -1).join('.');
  if (parent && (field.path.endsWith('.ohm') || field.path.endsWith('.farad'))) return problems.get(parent) ?? null;
  return null;
}

export function getPath(object: unknown, path: string): unknown {
  let current: unknown = object;
  for (const key of path.split('.')) {
    if (typeof current !== 'object' || current === null) return undefined;
    current = (current as Record<string, unknown>)[key];
  }
  return current;
}

function setPath(object: Record<string, unknown>, path: string, value: unknown): void {
  const keys = path.split('.');
  let current = object;
  for (const key of keys.slice(0, -1)) {
    if (typeof current[key] !== 'object' || current[key] === null) current[key] = {};
    current = current[key] as Record<string, unknown>;
  }
  current[keys[keys.length - 1]] = value;
}

function deletePath(object: Record<string, unknown>, path: string): void {
  const keys = path.split('.');
  const parentPath = keys.slice(0, -1);
  let current: unknown = object;
  for (const key of parentPath) {
    if (typeof current !== 'object' || current === null) return;
    current = (current as Record<string, unknown>)[key];
  }
  if (typeof current !== 'object' || current === null) return;
  delete (current as Record<string, unknown>)[keys[keys.length - 1]];
  // An optional part left with only its ref (or nothing) is no part at all.
  if (parentPath.length === 2 && parentPath[0] === 'parts') {
    const part = current as Record<string, unknown>;
    if (part.ohm === undefined && part.farad === undefined) deletePath(object, parentPath.join('.'));
  }
  // A power stage with every field cleared is no power stage (the design's load is optional as a whole).
  if (parentPath.length === 1 && parentPath[0] === 'load' && Object.keys(current).length === 0) delete object.load;
}
