import { lstatSync, readlinkSync, realpathSync, statSync } from "node:fs";
import { basename, dirname, isAbsolute, join, resolve, sep } from "node:path";
import { InputError } from "../errors.js";

/** A file's identity: device and inode of what a path names after following symbolic links. */
export interface FileIdentity {
  dev: number;
  ino: number;
}

/** The identity of the file `path` names (links followed), or undefined when nothing is there. */
export function fileIdentity(path: string): FileIdentity | undefined {
  try {
    const st = statSync(path);
    return { dev: st.dev, ino: st.ino };
  } catch {
    return undefined;
  }
}

/** True when both identities are known and equal (the same file, whatever the paths). */
export function sameFile(a: FileIdentity | undefined, b: FileIdentity | undefined): boolean {
  return a !== undefined && b !== undefined && a.dev === b.dev && a.ino === b.ino;
}

/** True for paths under the kernel's device and process trees, which are never atomic outputs. */
function isSystemPath(path: string): boolean {
  const abs = resolve(path);
  return abs === "/dev" || abs.startsWith(`/dev${sep}`) || abs === "/proc" || abs.startsWith(`/proc${sep}`);
}

/**
 * Where a write to `path` lands: `path` itself, or, when `path` is a symbolic link (a chain of
 * them), the regular file at its end (existing or not yet). Anything else at the end (a directory,
 * device, FIFO or socket), a path under /dev or /proc, or a loop of links is an InputError naming
 * `path`: atomic outputs replace regular files only.
 */
export function outputTarget(path: string): string {
  if (isSystemPath(path)) {
    throw new InputError(`${path}: a device or system file; outputs are written to regular files only (leave out the option to print to standard output)`);
  }
  let current = path;
  for (let hops = 0; ; hops++) {
    let st;
    try {
      st = lstatSync(current);
    } catch {
      return current; // nothing there yet: a new file
    }
    if (st.isSymbolicLink()) {
      if (hops >= 40) throw new InputError(`${path}: too many levels of symbolic links`);
      const link = readlinkSync(current);
      current = isAbsolute(link) ? link : join(dirname(current), link);
      if (isSystemPath(current)) {
        throw new InputError(`${path}: links to ${current}, a device or system file; outputs are written to regular files only`);
      }
      continue;
    }
    if (st.isDirectory()) throw new InputError(`${path}: is a directory; give a file name`);
    if (!st.isFile()) throw new InputError(`${path}: a device, FIFO or other special file; outputs are written to regular files only`);
    return current;
  }
}

/**
 * A key equal for two paths that name the same file or would create the same file: the file's
 * identity when it exists, else the real path of its directory plus its name.
 */
export function pathKey(path: string): string {
  const id = fileIdentity(path);
  if (id) return `id:${id.dev}:${id.ino}`;
  let target: string;
  try {
    target = outputTarget(path);
  } catch {
    target = path;
  }
  let dir = resolve(dirname(target));
  try {
    dir = realpathSync(dir);
  } catch {
    // a directory yet to be created: its resolved name is the best key there is
  }
  return `path:${join(dir, basename(target))}`;
}
