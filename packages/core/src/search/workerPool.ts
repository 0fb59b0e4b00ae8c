import { existsSync } from "node:fs";
import { availableParallelism } from "node:os";
import { fileURLToPath } from "node:url";
import { Worker } from "node:worker_threads";
import { InputError } from "../errors.js";
import type { FftBackendName } from "../fft/types.js";
import type { Trigger } from "../filter/peaks.js";
import type { BankFilterConfig, PeakWindow } from "./bankFilter.js";
import type { SegmentWeights } from "./segmentWeights.js";

/** What each worker receives once (structured-cloned; the SharedArrayBuffers are shared, not copied). */
export interface WorkerInit {
  config: BankFilterConfig;
  /**
   * The filter weights u and C (see SegmentWeights) of each slot: the search loads the next
   * segment into one slot while the workers filter the other.
   */
  u: SharedArrayBuffer[];
  cumulative: SharedArrayBuffer[];
  /** Template masses (m1, m2 pairs, solar masses). */
  masses: Float64Array;
  /** Template aligned spins (χ1, χ2 pairs), absent for a non-spinning bank. */
  spins?: Float64Array;
  /** σ per template of each slot, written by whichever worker filters it. */
  sigmas: SharedArrayBuffer[];
  /** Next unclaimed template index (Int32), advanced with Atomics.add. */
  counter: SharedArrayBuffer;
}

/** One segment's job: the band of the weights just loaded, and where to look for peaks. */
export interface WorkerJob {
  segment: number;
  /** Which slot's weights to filter against and σ to write. */
  slot: number;
  kLow: number;
  kHigh: number;
  scale: number;
  /** Templates claimed per Atomics.add. */
  chunk: number;
  /** Templates [from, to) of the bank to filter (the counter starts at `from`). */
  from: number;
  to: number;
  peaks: PeakWindow;
}

/** What the pool sends a worker: a segment's job, or the request to stop. */
export type PoolMessage = ({ kind: "job" } & WorkerJob) | { kind: "close" };

export type WorkerReply =
  | { kind: "ready"; backend: FftBackendName }
  | { kind: "done"; segment: number; triggers: Trigger[] }
  | { kind: "error"; message: string; inputError: boolean };

/**
 * The compiled worker script, dist/search/searchWorker.js: next to this module when it runs
 * compiled, or the package's dist when it runs as TypeScript source (tests; build it first with
 * `npx tsc -b packages/core`).
 */
export function searchWorkerUrl(): URL {
  const here = import.meta.url;
  return here.endsWith(".js") ? new URL("./searchWorker.js", here) : new URL("../../dist/search/searchWorker.js", here);
}

/**
 * Default thread count of a search: os.availableParallelism() when this module runs compiled
 * (the worker script is its sibling), else 1 (TypeScript source, where workers would run the
 * separately built dist; ask for threads explicitly there).
 */
export function defaultSearchThreads(): number {
  return import.meta.url.endsWith(".js") ? availableParallelism() : 1;
}

/**
 * Most worker threads a search starts: 4 per core. Each thread holds its own FFT plan and SNR
 * series; beyond a few per core they only add memory and switching (300 threads on 2 cores were
 * measured 9× slower, with 4.6 GB resident).
 */
export const THREADS_PER_CORE_LIMIT = 4;

/** {@link THREADS_PER_CORE_LIMIT} × the cores of this machine. */
export function maxSearchThreads(): number {
  return THREADS_PER_CORE_LIMIT * availableParallelism();
}

/** Most time (ms) a worker asked to stop gets to end its event loop before it is terminated. */
const CLOSE_GRACE_MS = 5000;

/**
 * Stops a worker by asking it to close its port, so that it ends its event loop and exits like a
 * finished program; terminate() is the fallback after CLOSE_GRACE_MS. Terminating a busy isolate
 * outright can abort the whole process in Node 20 while V8 still runs background compile tasks for
 * it (an assertion in NodePlatform::ForIsolate, seen once in CI with 8 workers on 2 cores).
 */
async function closeWorker(worker: Worker): Promise<void> {
  if (worker.threadId < 0) return; // already gone
  const exited = new Promise<void>((resolve) => worker.once("exit", () => resolve()));
  worker.postMessage({ kind: "close" } satisfies PoolMessage);
  let timer: NodeJS.Timeout | undefined;
  const late = new Promise<"late">((resolve) => {
    timer = setTimeout(() => resolve("late"), CLOSE_GRACE_MS);
  });
  const how = await Promise.race([exited.then(() => "exited" as const), late]);
  clearTimeout(timer);
  if (how === "late") await worker.terminate();
}

/** Worker threads that filter a bank over one segment at a time (see searchStrain). */
export interface SearchPool {
  readonly threads: number;
  readonly backend: FftBackendName;
  /** σ (at 1 Mpc) per template of the last segment run in each slot. */
  readonly sigmas: readonly Float64Array[];
  /**
   * Filters templates [from, to) (default the whole bank) against slot `slot`'s weights (already
   * loaded by the caller, who must not touch them until this resolves), writes their σ into
   * `sigmas[slot]` and returns the peaks, ordered by template then sample index: the order one
   * thread produces. One run at a time; the other slot may be loaded meanwhile.
   */
  run(segment: number, slot: number, peaks: PeakWindow, from?: number, to?: number): Promise<Trigger[]>;
  close(): Promise<void>;
}

/**
 * Starts `threads` workers sharing the weights of each slot (whose arrays must live in
 * SharedArrayBuffers; one slot, or two for a double buffer) and
 * resolves when each has loaded its FFT backend and made its plan. Templates are handed out in
 * chunks through a shared atomic counter, so the load balances itself; memory per worker is one
 * complex plan of the segment length.
 */
export async function createSearchPool(
  threads: number,
  config: BankFilterConfig,
  slots: readonly SegmentWeights[],
  masses: Float64Array,
  spins?: Float64Array,
): Promise<SearchPool> {
  const url = searchWorkerUrl();
  const path = fileURLToPath(url);
  if (!existsSync(path)) {
    throw new InputError(`threads: the compiled search worker ${path} is missing; build it with \`npx tsc -b packages/core\` or use threads = 1`);
  }
  for (const weights of slots) {
    if (!(weights.u.buffer instanceof SharedArrayBuffer) || !(weights.cumulative.buffer instanceof SharedArrayBuffer)) {
      throw new Error("createSearchPool: the segment weights must live in SharedArrayBuffers");
    }
  }
  const count = masses.length / 2;
  const sigmaBuffers = slots.map(() => new SharedArrayBuffer(8 * count));
  const counterBuffer = new SharedArrayBuffer(4);
  const counter = new Int32Array(counterBuffer);
  const init: WorkerInit = {
    config,
    u: slots.map((w) => w.u.buffer as SharedArrayBuffer),
    cumulative: slots.map((w) => w.cumulative.buffer as SharedArrayBuffer),
    masses,
    ...(spins ? { spins } : {}),
    sigmas: sigmaBuffers,
    counter: counterBuffer,
  };
  const workers: Worker[] = [];
  const pending: ({ resolve: (m: WorkerReply) => void; reject: (e: Error) => void } | undefined)[] = [];
  let closing = false;
  const nextReply = (i: number): Promise<WorkerReply> =>
    new Promise((resolve, reject) => {
      pending[i] = { resolve, reject };
    }).then((m) => {
      const reply = m as WorkerReply;
      if (reply.kind === "error") throw reply.inputError ? new InputError(reply.message) : new Error(`search worker: ${reply.message}`);
      return reply;
    });
  const settle = (i: number): { resolve: (m: WorkerReply) => void; reject: (e: Error) => void } | undefined => {
    const p = pending[i];
    pending[i] = undefined;
    return p;
  };
  const replies: Promise<WorkerReply>[] = [];
  for (let i = 0; i < threads; i++) {
    const worker = new Worker(url, { workerData: init });
    workers.push(worker);
    replies.push(nextReply(i));
    worker.on("message", (m: WorkerReply) => settle(i)?.resolve(m));
    worker.on("error", (e: Error) => settle(i)?.reject(e));
    worker.on("exit", (code) => {
      if (!closing) settle(i)?.reject(new Error(`search worker ${i} exited early (code ${code})`));
    });
  }
  const close = async (): Promise<void> => {
    closing = true;
    await Promise.all(workers.map(closeWorker));
  };
  let backend: FftBackendName = config.backend;
  try {
    for (const r of await Promise.all(replies)) if (r.kind === "ready") backend = r.backend;
  } catch (error) {
    await close();
    throw error;
  }
  const sigmas = sigmaBuffers.map((b) => new Float64Array(b));
  // Small enough chunks that the threads finish a segment together, large enough to be few.
  const chunk = Math.max(1, Math.floor(count / (16 * threads)));
  return {
    threads,
    backend,
    sigmas,
    async run(segment, slot, peaks, from = 0, to = count) {
      const w = slots[slot];
      Atomics.store(counter, 0, from);
      const job: PoolMessage = { kind: "job", segment, slot, kLow: w.kLow, kHigh: w.kHigh, scale: w.scale, chunk, from, to, peaks };
      const done: Promise<WorkerReply>[] = [];
      for (let i = 0; i < threads; i++) {
        done.push(nextReply(i));
        workers[i].postMessage(job);
      }
      const triggers: Trigger[] = [];
      for (const r of await Promise.all(done)) if (r.kind === "done") for (const t of r.triggers) triggers.push(t);
      triggers.sort((a, b) => a.templateIndex - b.templateIndex || a.index - b.index);
      return triggers;
    },
    close,
  };
}
