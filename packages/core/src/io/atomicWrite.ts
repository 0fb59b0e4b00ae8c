import { closeSync, fsyncSync, openSync, readdirSync, readFileSync, renameSync, rmSync, writeSync } from "node:fs";
import { basename, dirname, join } from "node:path";
import { outputTarget } from "./fileIdentity.js";

let partialCounter = 0;

/**
 * The temporary name a write to `path` uses before its rename: hidden, beside it, carrying the
 * writer's process id (`.NAME.PID.MS-N.partial`), so a later run can tell a stale one from a live one.
 */
export function partialPathFor(path: string): string {
  return join(dirname(path), `.${basename(path)}.${process.pid}.${Date.now()}-${partialCounter++}.partial`);
}

function escapeRegExp(s: string): string {
  return s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
}

/** True when a process with this id exists (on this machine). */
function processAlive(pid: number): boolean {
  if (pid === process.pid) return true;
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === "EPERM";
  }
}

/**
 * Removes the temporary files of our own naming ({@link partialPathFor}, also nested) that writes
 * to `path` left behind when their process was killed: only those whose process no longer exists.
 * Files a pending set commit still lists are kept. Returns the names removed. A directory that
 * cannot be listed is left alone.
 */
export function removeStalePartials(path: string): string[] {
  const dir = dirname(path);
  const pattern = new RegExp(`^\\.+${escapeRegExp(basename(path))}\\.(\\d+)\\.\\d+(?:-\\d+)?\\.partial(?:\\.json)?(?:\\.\\d+\\.\\d+(?:-\\d+)?\\.partial)?$`);
  let names: string[];
  try {
    names = readdirSync(dir);
  } catch {
    return [];
  }
  // Files a pending set commit (fileSet.ts) still has to rename into place are not stale.
  const pending = new Set<string>();
  for (const name of names) {
    if (!name.startsWith(".") || !name.endsWith(".set-commit.json")) continue;
    try {
      const rec = JSON.parse(readFileSync(join(dir, name), "utf8")) as { members?: { staged?: unknown }[] };
      for (const m of rec.members ?? []) if (typeof m.staged === "string") pending.add(basename(m.staged));
    } catch {
      // unreadable: nothing to protect
    }
  }
  const removed: string[] = [];
  for (const name of names) {
    const m = pattern.exec(name);
    if (!m || pending.has(name) || processAlive(Number(m[1]))) continue;
    try {
      rmSync(join(dir, name), { force: true });
      removed.push(name);
    } catch {
      // not ours to remove after all (permissions): leave it
    }
  }
  return removed;
}

/** Flushes a directory's entries (a rename in it) to disk where the file system allows it. */
export function syncDirectory(dir: string): void {
  let fd = -1;
  try {
    fd = openSync(dir, "r");
    fsyncSync(fd);
  } catch {
    // Not every file system lets a directory be opened or synced; the rename is still atomic.
  } finally {
    if (fd >= 0) closeSync(fd);
  }
}

/**
 * Writes `content` (bytes, a string, or pieces of either, written as they come so a large file is
 * never one string in memory) to a new file at `path` and flushes it to disk (no rename).
 */
export function writeFileSynced(path: string, content: string | Uint8Array | Iterable<string | Uint8Array>): void {
  const fd = openSync(path, "w");
  try {
    const pieces = typeof content === "string" || content instanceof Uint8Array ? [content] : content;
    for (const piece of pieces) {
      const bytes = typeof piece === "string" ? Buffer.from(piece, "utf8") : piece;
      let off = 0;
      while (off < bytes.length) off += writeSync(fd, bytes, off, bytes.length - off);
    }
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
}

/**
 * Writes `content` to `path` so that a reader never sees a partial file: the bytes go to a
 * temporary file in the same directory ({@link partialPathFor}), are flushed, and the file is then
 * renamed over `path` (rename is atomic within one file system). A symbolic link at `path` is
 * written through: the regular file it points to is replaced and the link stays. Only regular
 * files are replaced: a directory, device, FIFO or anything under /dev or /proc is an InputError.
 * Stale temporary files of killed writes to the same path are removed first. On failure the
 * temporary file is removed, and a file-system error names `path`, not the temporary file.
 */
export function writeFileAtomic(path: string, content: string | Uint8Array | Iterable<string | Uint8Array>): void {
  const target = outputTarget(path);
  removeStalePartials(target);
  const tmp = partialPathFor(target);
  try {
    writeFileSynced(tmp, content);
    renameSync(tmp, target);
  } catch (err) {
    rmSync(tmp, { force: true });
    if (err && typeof err === "object" && "path" in err) (err as { path: string }).path = path;
    throw err;
  }
}
