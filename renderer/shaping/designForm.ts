/**
 * The Board screen's form as data: which fields, their labels and units, reading and writing them by path in a
 * design object, and the problems as typed, field by field (schema first, then the board physics).
 * DOM-free for unit tests.
 */
import { boardDesignSchema, type BoardDesign } from '../../app/board/design';
import { validateBoardPhysics } from '../../app/board/boardPhysics';
import { formatFarad, formatOhm } from '../../app/board/formatValues';
import { parseQuantity } from '../../app/board/parseQuantity';
import { isBoardPart, partNameCapitalised } from '../../app/board/partNames';

export interface DesignField {
  /** Dotted path in the design file, e.g. `parts.rEmitter.ohm`. */
  path: string;
  label: string;
  /** Unit the number is typed in; `kind` says how it is stored. */
  unit: string;
  /** `part`: a part value typed and shown in the drawing code (6k8, 390n), stored in ohm or farad. */
  kind: 'number' | 'text' | 'choice' | 'part';
  choices?: readonly string[];
  optional?: boolean;
  /** Takes two columns: a name read whole, not cut off. */
  wide?: boolean;
}

export interface DesignFieldGroup {
  title: string;
  fields: readonly DesignField[];
}

// Each part on one row: its value, its designator and its tolerance. The tolerance is what the trim planner weighs
// a reading against (a part far outside its own tolerance is replaced, not compensated), so it is the design's to say;
// left empty, the schema's default (5 % for a resistor, 10 % for the ramp capacitor) applies.
const tolerance = (role: string, label: string): DesignField => ({ path: `parts.${role}.tolerancePct`, label: `${label} ± (%)`, unit: '%', kind: 'number', optional: true });

const resistor = (role: string, label: string, optional = false): DesignField[] => [
  { path: `parts.${role}.ohm`, label, unit: 'ohm', kind: 'part', optional },
  { path: `parts.${role}.ref`, label: `${label}, ref`, unit: '', kind: 'text', optional: true },
  tolerance(role, label),
];

export const designFieldGroups: readonly DesignFieldGroup[] = [
  {
    title: 'Board',
    fields: [
      { path: 'name', label: 'Design name', unit: '', kind: 'text', wide: true },
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
      ...resistor('rEmitter', partNameCapitalised(null, 'rEmitter')),
      ...resistor('rBiasTop', partNameCapitalised(null, 'rBiasTop')),
      ...resistor('rBiasBottom', partNameCapitalised(null, 'rBiasBottom')),
      { path: 'parts.cRamp.farad', label: partNameCapitalised(null, 'cRamp'), unit: 'F', kind: 'part' },
      { path: 'parts.cRamp.ref', label: `${partNameCapitalised(null, 'cRamp')}, ref`, unit: '', kind: 'text', optional: true },
      tolerance('cRamp', partNameCapitalised(null, 'cRamp')),
      ...resistor('rDischarge', partNameCapitalised(null, 'rDischarge'), true),
    ],
  },
  {
    title: 'Control divider',
    fields: [...resistor('rControlTop', partNameCapitalised(null, 'rControlTop'), true), ...resistor('potControl', partNameCapitalised(null, 'potControl'), true)],
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
      { path: 'load.ohm', label: 'Load resistance', unit: 'ohm', kind: 'part', optional: true },
      { path: 'load.henry', label: 'Load inductance (mH)', unit: 'mH', kind: 'number', optional: true },
      { path: 'load.latchingCurrentA', label: 'Latching current (mA)', unit: 'mA', kind: 'number', optional: true },
    ],
  },
  {
    title: 'Reading tolerances (a reading inside passes)',
    fields: [
      { path: 'tolerances.rampPeakPct', label: 'Ramp peak (%)', unit: '%', kind: 'number', optional: true },
      { path: 'tolerances.alphaDeg', label: 'Firing angle (°)', unit: 'deg', kind: 'number', optional: true },
      { path: 'tolerances.startDelayDeg', label: 'Ramp start (°)', unit: 'deg', kind: 'number', optional: true },
    ],
  },
];

/**
 * Typed in millihenry and milliampere, stored in henry and ampere, as data sheets and load plates give them. Part
 * values are typed and shown as marked on the part (IEC 60062 code, app/board/formatValues.ts): 6k8, 390n.
 */
const typedScale: Record<string, number> = { mH: 1e-3, mA: 1e-3 };

export function fieldValueText(design: unknown, field: DesignField): string {
  const value = getPath(design, field.path);
  if (value === undefined || value === null) return '';
  // Six digits so an odd value from a file survives an edit of another field unchanged.
  if (typeof value === 'number' && field.kind === 'part') return field.unit === 'F' ? formatFarad(value, 6) : formatOhm(value, 6);
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
  if (field.kind === 'part') {
    const value = parseQuantity(trimmed);
    // A capacitance needs its letter: "0.47" could be microfarads or farads (kept as text, so the field says so).
    const plain = !/[a-zµ]/i.test(trimmed.replace(/e[-+]?\d+$/i, ''));
    return setPath(design, field.path, Number.isFinite(value) && value > 0 && !(field.unit === 'F' && plain) ? value : trimmed);
  }
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
      const notNumber = issue.code === 'invalid_type' && issue.expected === 'number' && typeof typed === 'string' ? notANumber(typed, path) : null;
      if (!problems.has(path)) problems.set(path, { severity: 'error', message: partTextProblem(input, path) ?? notNumber ?? issue.message });
    }
    return { design: null, problems };
  }
  for (const problem of validateBoardPhysics(parsed.data)) {
    if (!problems.has(problem.field) || problem.severity === 'error') problems.set(problem.field, { severity: problem.severity, message: problem.message });
  }
  return { design: parsed.data, problems };
}

/** Where a problem sits, in the words of the form (a field's label, or the part in words), never the file's key. */
export function pathWords(path: string): string {
  const field = designFieldGroups.flatMap((group) => group.fields).find((candidate) => candidate.path === path || candidate.path.startsWith(`${path}.`));
  if (field) return field.label;
  const part = /^parts\.([A-Za-z]+)/.exec(path)?.[1];
  if (part && isBoardPart(part)) return partNameCapitalised(null, part);
  return path === '' ? 'The design' : path.split('.').pop() ?? path;
}

/** A part value field holding text that is not a value: say how to write it. */
function partTextProblem(input: unknown, path: string): string | null {
  const field = designFieldGroups.flatMap((group) => group.fields).find((candidate) => candidate.path === path && candidate.kind === 'part');
  const text = getPath(input, path);
  if (!field || typeof text !== 'string') return null;
  return field.unit === 'F' ? `"${text}" is not a capacitance: write it as marked, with its letter (390n, 4u7, 220p)` : `"${text}" is not a resistance: write it as marked (6k8, 470R, 1M5) or in ohms`;
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
