// The sign-off gate's rule: every step recorded and within tolerance, else exceptions and a written reason.
import { describe, expect, it } from 'vitest';
import { reasonProblem, signOffExceptions, signOffExceptionText, signOffGateOf, normalisedReason } from '../../../app/bench/signOffGate';
import type { Reading, StepReport, Verdict } from '../../../app/contract';

const reading = (label: string, verdict: Verdict | null): Reading => ({ key: label, label, unit: '', value: null, expected: null, low: null, high: null, verdict, note: null });
const step = (name: StepReport['step'], verdict: Verdict, readings: Reading[] = []): StepReport => ({ step: name, status: 'done', verdict, readings, cycles: 50, note: null });

describe('signOffGateOf', () => {
  it('clears when every step is recorded and in tolerance or marginal (marginal lies inside the band)', () => {
    const recorded = { sync: step('sync', 'in-tolerance'), ramp: step('ramp', 'marginal'), trim: step('trim', 'in-tolerance'), transfer: step('transfer', 'in-tolerance'), limits: step('limits', 'in-tolerance') };
    expect(signOffGateOf(recorded)).toEqual({ clear: true, exceptions: [], reasonMinimumCharacters: 20 });
  });

  it('lists each step that stands in the way, with the readings behind it, in bench order', () => {
    const recorded = {
      limits: step('limits', 'out-of-tolerance', [reading('Largest alpha', 'in-tolerance'), reading('Smallest alpha', 'out-of-tolerance'), reading('Missing pulses', 'out-of-tolerance')]),
      sync: step('sync', 'in-tolerance'),
      transfer: step('transfer', 'not-measured', [reading('Alpha at the top of the control (6.47 V)', 'not-measured'), reading('Transfer gain', null)]),
    };
    const exceptions = signOffExceptions(recorded);
    expect(exceptions).toEqual([
      { step: 'ramp', problem: 'not-recorded', readings: [] },
      { step: 'trim', problem: 'not-recorded', readings: [] },
      { step: 'transfer', problem: 'not-measured', readings: ['Alpha at the top of the control (6.47 V)'] },
      { step: 'limits', problem: 'out-of-tolerance', readings: ['Smallest alpha', 'Missing pulses'] },
    ]);
    expect(exceptions.map(signOffExceptionText)).toEqual([
      'Check ramp: not recorded',
      'Trim if needed: not recorded',
      'Record transfer curve: not measured yet (Alpha at the top of the control (6.47 V))',
      'Check limits and pulses: out of tolerance (Smallest alpha, Missing pulses)',
    ]);
    expect(signOffGateOf(recorded).clear).toBe(false);
  });
});

describe('the written reason', () => {
  it('must say something: at least 3 words and 20 characters, white space not counted twice', () => {
    expect(reasonProblem('')).toMatch(/write why/);
    expect(reasonProblem('   \n ')).toMatch(/write why/);
    expect(reasonProblem('ok')).toMatch(/at least 3 words and 20 characters/);
    expect(reasonProblem('n/a n/a n/a')).toMatch(/at least 3 words/);
    expect(reasonProblem('customeracceptedthisunit')).toMatch(/at least 3 words/);
    expect(reasonProblem('limits checked on site')).toBeNull();
    expect(normalisedReason('  limits   checked\n on site ')).toBe('limits checked on site');
  });
});
