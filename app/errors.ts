/**
 * Expected faults get a typed error whose message a technician understands: a bad file, a bad design value,
 * a garbled serial frame. Anything else that throws is a bug. The command line prints `InputError`s and exits 2.
 */
export class InputError extends Error {
  /** Where the fault is: a file and line, a field path, a serial port. */
  readonly where: string | undefined;

  constructor(message: string, where?: string) {
    super(where ? `${where}: ${message}` : message);
    this.name = 'InputError';
    this.where = where;
  }
}

export function isInputError(error: unknown): error is InputError {
  return error instanceof InputError;
}
