// Talks to the HDF5 worker thread (internal; see hdf5Worker.ts for the requests).
//
// Why a worker: h5wasm runs the HDF5 library synchronously, and on some damaged files it loops
// forever (seen when reading an attribute of a randomly mutated file) or traps. In a worker a
// request can be given a time limit: on a timeout or a trap the worker is terminated, and the
// next request starts a fresh one. Files opened in a terminated worker are gone; their handles
// carry the worker's generation so that a later read says so instead of reading garbage.
// The worker is unref'd while idle, so an open file never keeps the process alive.
import { Worker } from "node:worker_threads";
import { HDF5_WORKER_SOURCE } from "./hdf5Worker.js";

/** Why an HDF5 request failed: the library's reason, a trap, a timeout, or a lost worker. */
export class Hdf5Failure extends Error {
  constructor(
    readonly kind: "hdf5" | "trap" | "timeout" | "lost",
    readonly reason: string,
  ) {
    super(reason);
    this.name = "Hdf5Failure";
  }
}

interface Pending {
  resolve(value: unknown): void;
  reject(err: Error): void;
  timer: NodeJS.Timeout;
}

interface Reply {
  id?: number;
  ok?: boolean;
  value?: unknown;
  kind?: "hdf5" | "trap";
  reason?: string;
  ready?: boolean;
  fatal?: string;
}

let baseTimeoutMs = 60_000;

/**
 * Sets the time an HDF5 request may take before the worker is presumed stuck (default 60 s; reads
 * and writes get 10 µs more per sample). For tests of damaged files.
 */
export function setHdf5TimeoutMs(ms: number): void {
  baseTimeoutMs = ms;
}

class Hdf5Worker {
  private readonly worker: Worker;
  private readonly pending = new Map<number, Pending>();
  private nextId = 1;
  private dead = false;
  readonly ready: Promise<void>;

  constructor(readonly generation: number) {
    this.worker = new Worker(HDF5_WORKER_SOURCE, {
      eval: true,
      workerData: { h5url: import.meta.resolve("h5wasm/node") },
      stdout: false,
      stderr: false,
    });
    this.worker.unref();
    this.ready = new Promise<void>((resolve, reject) => {
      const onReady = (msg: Reply) => {
        if (msg.ready) {
          this.worker.off("message", onReady);
          this.worker.on("message", (m: Reply) => this.onReply(m));
          resolve();
        } else if (msg.fatal !== undefined) {
          this.kill(new Hdf5Failure("lost", `the HDF5 library could not start (${msg.fatal})`));
          reject(new Hdf5Failure("lost", `the HDF5 library could not start (${msg.fatal})`));
        }
      };
      this.worker.on("message", onReady);
      this.worker.once("error", (err) => {
        const failure = new Hdf5Failure("lost", `the HDF5 worker failed (${err.message})`);
        reject(failure);
        this.kill(failure);
      });
      this.worker.once("exit", () => {
        const failure = new Hdf5Failure("lost", "the HDF5 worker stopped");
        reject(failure);
        this.kill(failure);
      });
    });
    this.ready.catch(() => undefined);
  }

  private onReply(msg: Reply): void {
    const p = msg.id === undefined ? undefined : this.pending.get(msg.id);
    if (!p || msg.id === undefined) return;
    this.settle(msg.id);
    if (msg.ok) p.resolve(msg.value);
    else {
      const failure = new Hdf5Failure(msg.kind ?? "hdf5", msg.reason ?? "unknown HDF5 error");
      // After a trap the library's state is suspect: replace the worker.
      if (failure.kind === "trap") this.kill(new Hdf5Failure("lost", "the HDF5 worker was restarted after a failure"));
      p.reject(failure);
    }
  }

  private settle(id: number): void {
    const p = this.pending.get(id);
    if (!p) return;
    clearTimeout(p.timer);
    this.pending.delete(id);
    if (this.pending.size === 0 && !this.dead) this.worker.unref();
  }

  /** Stops the worker and fails every pending request with `failure`. */
  kill(failure: Hdf5Failure): void {
    if (this.dead) return;
    this.dead = true;
    if (current === this) current = undefined;
    for (const [id, p] of [...this.pending]) {
      clearTimeout(p.timer);
      this.pending.delete(id);
      p.reject(failure);
    }
    void this.worker.terminate().catch(() => undefined);
  }

  get alive(): boolean {
    return !this.dead;
  }

  request(op: string, args: unknown, timeoutMs: number, transfer: ArrayBuffer[] = []): Promise<unknown> {
    if (this.dead) return Promise.reject(new Hdf5Failure("lost", "the HDF5 worker was restarted after a failure"));
    const id = this.nextId++;
    return new Promise((resolve, reject) => {
      const timer = setTimeout(() => {
        this.pending.delete(id);
        const seconds = Math.round(timeoutMs / 100) / 10;
        reject(new Hdf5Failure("timeout", `the HDF5 library did not finish within ${seconds} s; the file may be damaged`));
        this.kill(new Hdf5Failure("lost", "the HDF5 worker was restarted after a timeout"));
      }, timeoutMs);
      timer.unref();
      this.pending.set(id, { resolve, reject, timer });
      if (this.pending.size === 1) this.worker.ref();
      this.worker.postMessage({ id, op, args }, transfer);
    });
  }
}

let current: Hdf5Worker | undefined;
let generations = 0;

/** The live worker, started on first use (and again after a timeout or a trap). */
async function hdf5Worker(): Promise<Hdf5Worker> {
  if (current === undefined || !current.alive) current = new Hdf5Worker(++generations);
  const w = current;
  await w.ready;
  return w;
}

/**
 * Sends one request to the worker and returns its answer with the generation of the worker that
 * gave it; rejects with an {@link Hdf5Failure}. With `generation`, fails at once when that worker
 * is gone (its files went with it).
 */
export async function hdf5Request<T>(
  op: "open" | "attrs" | "read" | "close" | "write",
  args: Record<string, unknown>,
  options: { samples?: number; transfer?: ArrayBuffer[]; generation?: number } = {},
): Promise<{ value: T; generation: number }> {
  if (options.generation !== undefined && (current === undefined || current.generation !== options.generation)) {
    throw new Hdf5Failure("lost", "the HDF5 worker was restarted after a failure in another file; open the file again");
  }
  const w = await hdf5Worker();
  const timeoutMs = baseTimeoutMs + (options.samples ?? 0) / 100;
  const value = (await w.request(op, args, timeoutMs, options.transfer)) as T;
  return { value, generation: w.generation };
}
