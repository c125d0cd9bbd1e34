/** The InputError an action throws; fails the test if it throws nothing or something else. */
import { expect } from 'vitest';
import { InputError } from '../../app/errors';

export function inputErrorOf(action: () => unknown): InputError {
  try {
    action();
  } catch (error) {
    expect(error).toBeInstanceOf(InputError);
    return error as InputError;
  }
  throw new Error('expected an InputError');
}
