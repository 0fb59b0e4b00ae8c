import { closeSync, fsyncSync, openSync, readFileSync, renameSync, rmSync, writeSync } from "node:fs";
import { hostname } from "node:os";
import { InputError } from "../errors.js";

/** What a lock file holds: who holds it. */
interface LockOwner {
  pid: number;
  /** The process's start time in clock ticks since boot (Linux), to tell a reused pid apart. */
  started: number | null;
  host: string;
}

/** An acquired lock; `release` removes the file (if it is still ours). */
export interface RunLock {
  readonly path: string;
  release(): void;
}

/** Start time of process `pid` in clock ticks since boot, from /proc (null where there is none). */
function processStartTicks(pid: number): number | null {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, "utf8");
    // Field 22, counted after the command name in parentheses (which may itself hold spaces).
    const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
    const ticks = Number(fields[19]);
    return Number.isFinite(ticks) ? ticks : null;
  } catch {
    return null;
  }
}

function alive(owner: LockOwner): boolean {
  try {
    process.kill(owner.pid, 0);
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== "EPERM") return false;
  }
  const started = processStartTicks(owner.pid);
  return owner.started === null || started === null || started === owner.started;
}

function readOwner(path: string): LockOwner | undefined {
  try {
    const o = JSON.parse(readFileSync(path, "utf8")) as LockOwner;
    return typeof o?.pid === "number" && typeof o.host === "string" ? o : undefined;
  } catch {
    return undefined;
  }
}

/**
 * Takes the lock file `path` for this process (created exclusively, holding pid, process start
 * time and host), so that two live runs never share what it guards. A lock left by a process that
 * no longer exists on this host (killed) is stale and taken over. A live holder, or one on another
 * host that cannot be checked, is an InputError naming `what` and the holder. The lock is released
 * by `release()` or when the process exits normally.
 */
export function acquireRunLock(path: string, what: string): RunLock {
  const me: LockOwner = { pid: process.pid, started: processStartTicks(process.pid), host: hostname() };
  const text = `${JSON.stringify(me)}\n`;
  for (let attempt = 0; attempt < 3; attempt++) {
    let fd = -1;
    try {
      fd = openSync(path, "wx");
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== "EEXIST") throw err;
      const owner = readOwner(path);
      if (owner && owner.host !== me.host) {
        throw new InputError(`${what}: in use by process ${owner.pid} on ${owner.host} (lock ${path}); if that run is gone, delete the lock`);
      }
      if (owner && alive(owner)) throw new InputError(`${what}: in use by a running process ${owner.pid} (lock ${path}); wait for it or give another location`);
      // Stale (its process is gone) or unreadable: move it aside atomically (one taker wins), then retry.
      try {
        const aside = `${path}.stale.${process.pid}`;
        renameSync(path, aside);
        rmSync(aside, { force: true });
      } catch {
        // another process took it over first; the retry decides
      }
      continue;
    }
    try {
      writeSync(fd, text);
      fsyncSync(fd);
    } finally {
      closeSync(fd);
    }
    let released = false;
    const release = (): void => {
      if (released) return;
      released = true;
      process.removeListener("exit", release);
      const owner = readOwner(path);
      if (owner && owner.pid === me.pid && owner.host === me.host) rmSync(path, { force: true });
    };
    process.on("exit", release);
    return { path, release };
  }
  throw new InputError(`${what}: could not take the lock ${path} (another run keeps taking it)`);
}
