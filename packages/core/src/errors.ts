/**
 * An error caused by what the caller supplied (a file, a flag, a parameter), as opposed to a bug.
 * The message is one line a person can act on and names the file or parameter that was wrong,
 * e.g. `strain.f32.json: sampleRate must be a positive number (got "4k")`.
 * The CLI prints it on stderr without a stack trace and exits with code 2.
 */
export class InputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "InputError";
  }
}
