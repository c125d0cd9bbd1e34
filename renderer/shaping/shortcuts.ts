/**
 * Keyboard shortcuts for the step flow, as a pure table so the keys are tested without a DOM and listed
 * on screen from the same source. Letters never fire while the user types in a field.
 */
import { commissioningStepNames, type CommissioningStep } from '../../app/contract/readings';

export type ScreenName = 'board' | 'bench' | 'transfer' | 'trim' | 'logbook';
export const screenNames: readonly ScreenName[] = ['board', 'bench', 'transfer', 'trim', 'logbook'];

export type StepName = CommissioningStep;
export const stepNames: readonly StepName[] = commissioningStepNames;

export type ShortcutAction =
  | { kind: 'screen'; screen: ScreenName }
  | { kind: 'step'; step: StepName }
  | { kind: 'next-step' }
  | { kind: 'previous-step' }
  | { kind: 'check-step' }
  | { kind: 'hold' }
  | { kind: 'keep-capture' }
  | { kind: 'theme' }
  | { kind: 'help' };

export interface KeyPress {
  key: string;
  /** Physical key ("Digit1"); Alt+digit on some layouts types a symbol in `key`. */
  code?: string;
  altKey: boolean;
  ctrlKey: boolean;
  metaKey: boolean;
  /** True when focus is in an input, select, textarea or contenteditable. */
  inEditableField: boolean;
}

/** The list shown in the shortcut help, same order as the table below. */
export const shortcutHelp: readonly { keys: string; does: string }[] = [
  { keys: 'Alt+1 … Alt+5', does: 'Board, Bench, Transfer, Trim, Logbook' },
  { keys: '1 … 6', does: 'Go to a commissioning step' },
  { keys: 'N / P', does: 'Next / previous step' },
  { keys: 'Enter', does: 'Check the current step' },
  { keys: 'H', does: 'Hold or release the cycle fold' },
  { keys: 'K', does: 'Keep the last seconds as a capture' },
  { keys: 'T', does: 'Light or dark theme' },
  { keys: '?', does: 'Show these shortcuts' },
];

export function shortcutFor(press: KeyPress): ShortcutAction | null {
  if (press.ctrlKey || press.metaKey) return null;
  if (press.altKey) {
    const index = digitIndex(press.code?.startsWith('Digit') ? press.code.slice(5) : press.key);
    return index !== null && index < screenNames.length ? { kind: 'screen', screen: screenNames[index] } : null;
  }
  if (press.inEditableField) return null;
  const index = digitIndex(press.key);
  if (index !== null) return index < stepNames.length ? { kind: 'step', step: stepNames[index] } : null;
  switch (press.key.toLowerCase()) {
    case 'n':
      return { kind: 'next-step' };
    case 'p':
      return { kind: 'previous-step' };
    case 'enter':
      return { kind: 'check-step' };
    case 'h':
      return { kind: 'hold' };
    case 'k':
      return { kind: 'keep-capture' };
    case 't':
      return { kind: 'theme' };
    case '?':
      return { kind: 'help' };
    default:
      return null;
  }
}

/** "1".."9" -> 0..8. */
function digitIndex(key: string): number | null {
  return /^[1-9]$/.test(key) ? Number(key) - 1 : null;
}

/** Step after/before `current`, clamped at the ends of the flow. */
export function stepMove(current: StepName, by: 1 | -1): StepName {
  const index = stepNames.indexOf(current);
  return stepNames[Math.min(stepNames.length - 1, Math.max(0, index + by))];
}
