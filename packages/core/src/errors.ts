/**
 * An error caused by what the caller supplied (a file, a flag, a parameter), as opposed to a bug.
 * The message is one line a person can act on and names the file or parameter that was wrong,
 * e.g. `strain.f32.json: sampleRate must be a positive number (got "4k")`.
 * `parameter`, when set, names the library parameter (of the options the caller passed) that the
 * error is about, so a front end can point at its own name for it.
 * The CLI prints it on stderr without a stack trace and exits with code 2.
 *
 * An error about one option of a core function carries that option's name in `parameter` (the
 * library's own name, e.g. "fMinHz") and the message without the name in `detail`, so a caller
 * can name the option in its own terms (the CLI maps parameters to flags in one table).
 */
export class InputError extends Error {
  /** The option of the core call that was wrong, in the library's terms ("fMinHz"), when one was. */
  readonly parameter?: string;
  /** The message without the parameter's name (set with `parameter`). */
  readonly detail?: string;

  constructor(message: string, about?: { parameter: string; detail: string }) {
    super(message);
    this.name = "InputError";
    if (about) {
      this.parameter = about.parameter;
      this.detail = about.detail;
    }
  }
}

/** An InputError about one option: message `parameter: detail`, with both kept as fields. */
export function parameterError(parameter: string, detail: string): InputError {
  return new InputError(`${parameter}: ${detail}`, { parameter, detail });
}
