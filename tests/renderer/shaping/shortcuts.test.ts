import { describe, expect, it } from 'vitest';
import { shortcutFor, shortcutHelp, stepMove, type KeyPress } from '../../../renderer/shaping/shortcuts';

function press(key: string, extra: Partial<KeyPress> = {}): KeyPress {
  return { key, altKey: false, ctrlKey: false, metaKey: false, inEditableField: false, ...extra };
}

describe('shortcutFor', () => {
  it('digits go to commissioning steps in bench order (NAMING.md)', () => {
    expect(shortcutFor(press('1'))).toEqual({ kind: 'step', step: 'sync' });
    expect(shortcutFor(press('3'))).toEqual({ kind: 'step', step: 'trim' });
    expect(shortcutFor(press('6'))).toEqual({ kind: 'step', step: 'sign-off' });
    expect(shortcutFor(press('7'))).toBeNull();
  });

  it('Alt+digit goes to screens, by physical key when the layout types a symbol', () => {
    expect(shortcutFor(press('2', { altKey: true }))).toEqual({ kind: 'screen', screen: 'bench' });
    expect(shortcutFor(press('¡', { altKey: true, code: 'Digit5' }))).toEqual({ kind: 'screen', screen: 'logbook' });
    expect(shortcutFor(press('6', { altKey: true }))).toBeNull();
  });

  it('letters act on the flow but never while typing in a field', () => {
    expect(shortcutFor(press('h'))).toEqual({ kind: 'hold' });
    expect(shortcutFor(press('K'))).toEqual({ kind: 'keep-capture' });
    expect(shortcutFor(press('n'))).toEqual({ kind: 'next-step' });
    expect(shortcutFor(press('Enter'))).toEqual({ kind: 'check-step' });
    expect(shortcutFor(press('h', { inEditableField: true }))).toBeNull();
    expect(shortcutFor(press('1', { inEditableField: true }))).toBeNull();
    expect(shortcutFor(press('h', { ctrlKey: true }))).toBeNull();
  });

  it('every key in the help resolves to an action', () => {
    expect(shortcutHelp.length).toBeGreaterThan(5);
    for (const key of ['1', 'n', 'p', 'Enter', 'h', 'k', 't', '?']) expect(shortcutFor(press(key))).not.toBeNull();
  });
});

describe('stepMove', () => {
  it('moves along the flow and stops at its ends', () => {
    expect(stepMove('sync', 1)).toBe('ramp');
    expect(stepMove('sync', -1)).toBe('sync');
    expect(stepMove('sign-off', 1)).toBe('sign-off');
    expect(stepMove('limits', -1)).toBe('transfer');
  });
});
