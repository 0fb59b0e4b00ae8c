import { existsSync, statSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { UsageError } from "./errors.js";

/**
 * Checks, before any work, that a file can be written at `path` (its directory exists and the path
 * is not a directory), so a long run never fails at the end on an output it could not write.
 */
export function checkOutputFile(flag: string, path: string, inputs: readonly string[] = []): void {
  const dir = dirname(resolve(path));
  if (existsSync(dir) && !statSync(dir).isDirectory()) throw new UsageError(`${flag}: ${dirname(path)} is a file, not a directory, so ${path} cannot be written`);
  if (!existsSync(dir)) throw new UsageError(`${flag}: directory ${dirname(path)} does not exist`);
  if (existsSync(path) && statSync(path).isDirectory()) throw new UsageError(`${flag}: ${path} is a directory, expected a file name`);
  if (existsSync(path) && !statSync(path).isFile()) throw new UsageError(`${flag}: ${path} is a device or special file, expected a file name`);
  const target = resolve(path);
  for (const input of inputs) {
    if (resolve(input) === target) throw new UsageError(`${flag}: ${path} is one of the inputs; writing there would destroy it`);
  }
}

/** The files a strain path stands for: the file and, for raw samples, its JSON sidecar. */
export function strainInputPaths(files: readonly string[]): string[] {
  return files.flatMap((f) => [f, `${f}.json`]);
}

/** Checks that `path` is a directory or can be created as one (its parent exists). */
export function checkOutputDirectory(flag: string, path: string): void {
  if (existsSync(path)) {
    if (!statSync(path).isDirectory()) throw new UsageError(`${flag}: ${path} exists and is not a directory`);
    return;
  }
  const parent = dirname(resolve(path));
  if (existsSync(parent) && !statSync(parent).isDirectory()) throw new UsageError(`${flag}: ${dirname(path)} is a file, not a directory, so ${path} cannot be created`);
  if (!existsSync(parent)) throw new UsageError(`${flag}: directory ${dirname(path)} does not exist`);
}
