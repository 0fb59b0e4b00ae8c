import type { Command } from "commander";
import { BandError, InputError, TemplateLimitError } from "@chirpsieve/core";
import { describeInputError } from "./parameterFlags.js";

/** A mistake in how the command was called (a flag's value, a missing flag). Exit code 2. */
export class UsageError extends InputError {
  constructor(message: string) {
    super(message);
    this.name = "UsageError";
  }
}

/** True for errors that are the caller's to fix: print one line and exit 2. */
export function isInputError(err: unknown): err is Error {
  if (err instanceof InputError) return true;
  // Node's own errors for paths the user named (missing file, directory given, no permission).
  const code = (err as { code?: unknown } | null)?.code;
  return typeof code === "string" && ["ENOENT", "EISDIR", "ENOTDIR", "EACCES", "EPERM", "EEXIST"].includes(code);
}

/** One line describing a file-system error with the path it concerns. */
export function describeFsError(err: Error): string {
  const e = err as Error & { code?: string; path?: string };
  const what: Record<string, string> = {
    ENOENT: "no such file or directory",
    EISDIR: "is a directory, expected a file",
    ENOTDIR: "a parent of this path is not a directory",
    EACCES: "permission denied",
    EPERM: "operation not permitted",
    EEXIST: "already exists",
  };
  if (e.code && e.path && what[e.code]) return `${e.path}: ${what[e.code]}`;
  return e.message.split("\n")[0];
}

/**
 * Runs bank placement (or its option check), turning core's bank errors into usage errors on the flag
 * to change: a TemplateLimitError (the estimated count is above the limit) into one on --mass-range
 * that ends with `remedy`, what the user can change in this command; a BandError (too narrow a band)
 * into one on --fmin or --fmax.
 */
export function withBankFlagErrors<T>(work: () => T, remedy: string): T {
  try {
    return work();
  } catch (err) {
    if (err instanceof TemplateLimitError) throw new UsageError(`--mass-range: ${err.message}; ${remedy}`);
    if (err instanceof BandError) throw new UsageError(describeInputError(err));
    throw err;
  }
}

/**
 * Refuses an empty value for any option that names a file or directory (`--out ""` would otherwise
 * mean "no file" and write to standard output, or fail late): the flags whose argument is
 * `<file>`, `<dir>` or `<file...>`.
 */
export function refuseEmptyPaths(cmd: Command): void {
  const values = cmd.opts() as Record<string, unknown>;
  for (const option of cmd.options) {
    if (!/<(file|dir)\b/.test(option.flags)) continue;
    const value = values[option.attributeName()];
    const list = Array.isArray(value) ? value : [value];
    if (list.some((v) => typeof v === "string" && v.trim() === "")) {
      throw new UsageError(`${option.long ?? option.flags}: empty file name`);
    }
  }
}

/**
 * Runs `work`, turning an InputError it throws into a usage error on `flag` (`--flag: message`).
 * Any other error is a bug and passes through unchanged (exit 1 with the error, not 2).
 */
export function onFlag<T>(flag: string, work: () => T): T {
  try {
    return work();
  } catch (err) {
    if (err instanceof InputError && !(err instanceof UsageError)) throw new UsageError(`${flag}: ${err.message}`);
    throw err;
  }
}
