import { accessSync, constants, statSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { completePendingFileSets, InputError, outputTarget, pathKey, removeStalePartials } from "@chirpsieve/core";
import { UsageError } from "./errors.js";

/** A file a command reads, with the flag (or argument) that named it, in the user's terms. */
export interface InputFile {
  flag: string;
  path: string;
  /** How to show it in a message when not as `path` (e.g. `site-a=x.f32`). */
  shown?: string;
}

/** A file or directory a command writes. `createDirectory`: its directory may be created (a shard's). */
export interface OutputFile {
  flag: string;
  path: string;
  kind?: "file" | "directory";
  createDirectory?: boolean;
}

/** Every file one run of a command reads and writes, gathered before any work. */
export interface FilePlan {
  inputs: InputFile[];
  outputs: OutputFile[];
  /** Groups of inputs that must all be different files (the same strain twice would count twice). */
  distinct?: InputFile[][];
}

/** The files a strain path stands for: the file and, for raw samples, its JSON sidecar. */
export function strainInputs(flag: string, files: readonly string[]): InputFile[] {
  return files.flatMap((f) => [
    { flag, path: f },
    ...(/\.f(32|64)$/i.test(f) ? [{ flag, path: `${f}.json` }] : []),
  ]);
}

/** A noise-curve flag's value as an input, when it names a file rather than a built-in curve. */
export function noiseCurveInput(flag: string, spec: string | undefined): InputFile[] {
  if (!spec) return [];
  try {
    return statSync(spec).isFile() ? [{ flag, path: spec }] : [];
  } catch {
    return [];
  }
}

/** The nearest existing ancestor of a directory path. */
function existingAncestor(dir: string): string {
  let d = resolve(dir);
  for (;;) {
    try {
      statSync(d);
      return d;
    } catch {
      const up = dirname(d);
      if (up === d) return d;
      d = up;
    }
  }
}

function checkWritableDirectory(flag: string, dir: string, shown: string, mayCreate: boolean): void {
  let st;
  try {
    st = statSync(dir);
  } catch {
    if (!mayCreate) throw new UsageError(`${flag}: directory ${shown} does not exist`);
    const base = existingAncestor(dir);
    if (!statSync(base).isDirectory()) throw new UsageError(`${flag}: cannot create directory ${shown}: ${base} is a file`);
    return checkWritableDirectory(flag, base, base, false);
  }
  if (!st.isDirectory()) throw new UsageError(`${flag}: ${shown} is a file, not a directory`);
  try {
    accessSync(dir, constants.W_OK | constants.X_OK);
  } catch {
    throw new UsageError(`${flag}: directory ${shown} is not writable`);
  }
}

/** Checks one output file: a file name, in a writable directory, not a directory or special file. */
function checkOutput(o: OutputFile): string {
  const { flag, path } = o;
  if (path === "") throw new UsageError(`${flag}: empty file name`);
  if (o.kind === "directory") {
    try {
      const st = statSync(path);
      if (!st.isDirectory()) throw new UsageError(`${flag}: ${path} exists and is not a directory`);
      checkWritableDirectory(flag, path, path, false);
    } catch (err) {
      if (err instanceof UsageError) throw err;
      checkWritableDirectory(flag, dirname(resolve(path)), dirname(path), true);
    }
    return path;
  }
  if (/[\\/]$/.test(path)) throw new UsageError(`${flag}: ${path} names a directory; give a file name`);
  let target: string;
  try {
    target = outputTarget(path);
  } catch (err) {
    if (err instanceof InputError) throw new UsageError(`${flag}: ${err.message}`);
    throw err;
  }
  checkWritableDirectory(flag, dirname(resolve(target)), dirname(target), !!o.createDirectory);
  return target;
}

/**
 * Checks, before any work, everything a command will read and write, comparing real file
 * identities (device and inode after following links), not path strings:
 *   - every output can be written: a file name (not `dir/`), its directory exists (or, for a shard,
 *     can be created) and is writable, and it is not a directory, device, FIFO or /dev path;
 *   - no output is one of the inputs (through a link, a hard link or another spelling);
 *   - no two outputs are the same file;
 *   - within each `distinct` group no file is given twice.
 * Then completes any interrupted set write that concerns an input or output, and removes stale
 * temporary files of killed writes to the outputs. Errors name the flag and the file as given.
 */
export function checkFilePlan(plan: FilePlan): void {
  for (const group of plan.distinct ?? []) {
    const seen = new Map<string, InputFile>();
    for (const f of group) {
      const key = pathKey(f.path);
      const first = seen.get(key);
      if (first) {
        const [a, b] = [first.shown ?? first.path, f.shown ?? f.path];
        const same = first.path === f.path && a === b ? `${a} is given twice` : `${a} and ${b} are the same file`;
        throw new UsageError(`${f.flag}: ${same}; each input may appear once (it would be counted twice)`);
      }
      seen.set(key, f);
    }
  }
  const outputKeys = new Map<string, OutputFile>();
  const targets: string[] = [];
  for (const o of plan.outputs) {
    const target = checkOutput(o);
    if (o.kind === "directory") continue;
    targets.push(target);
    const key = pathKey(o.path);
    for (const i of plan.inputs) {
      if (pathKey(i.path) === key) {
        const what = i.path === o.path ? `is also an input (${i.flag})` : `is the same file as the input ${i.path} (${i.flag})`;
        throw new UsageError(`${o.flag}: ${o.path} ${what}; writing there would destroy it`);
      }
    }
    const other = outputKeys.get(key);
    if (other) {
      const same = other.path === o.path ? o.path : `${o.path} (the same file as ${other.path})`;
      throw new UsageError(`${o.flag}: ${same} is also the ${other.flag} output; give each output its own file`);
    }
    outputKeys.set(key, o);
  }
  try {
    completePendingFileSets([...plan.inputs.map((i) => i.path), ...targets]);
  } catch (err) {
    if (err instanceof InputError) throw new UsageError(err.message);
    throw err;
  }
  for (const t of targets) removeStalePartials(t);
}
