/**
 * An error caused by what the caller supplied (a file, a flag, a parameter), as opposed to a bug.
 * The message is one line a person can act on and names the file or parameter that was wrong,
 * e.g. `strain.f32.json: sampleRate must be a positive number (got "4k")`.
 * `parameter`, when set, names the library parameter (of the options the caller passed) that the
 * error is about, so a front end can point at its own name for it.
 * The CLI prints it on stderr without a stack trace and exits with code 2.
 */
export class InputError extends Error {
  readonly parameter?: string;
  constructor(message: string, parameter?: string) {
    super(message);
    this.name = "InputError";
    if (parameter !== undefined) this.parameter = parameter;
  }
}
