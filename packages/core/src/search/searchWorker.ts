// Worker-thread entry of the search (see workerPool.ts). Runs as dist/search/searchWorker.js.
// Reads the segment's filter weights from shared memory, claims template ranges from a shared
// counter, writes σ per template into a shared array and posts its peaks back per segment.
import { parentPort, workerData } from "node:worker_threads";
import { InputError } from "../errors.js";
import { loadFftBackends } from "../fft/backends.js";
import type { Trigger } from "../filter/peaks.js";
import { createBankFilter } from "./bankFilter.js";
import type { SegmentWeights } from "./segmentWeights.js";
import type { PoolMessage, WorkerInit, WorkerJob, WorkerReply } from "./workerPool.js";

const port = parentPort;
if (!port) throw new Error("searchWorker.js must run in a worker thread");
const init = workerData as WorkerInit;

function reply(message: WorkerReply): void {
  port!.postMessage(message);
}

try {
  await loadFftBackends();
  const bank = createBankFilter(init.config);
  // Pays the first touch of the plan's buffers now, while the main thread prepares the first segment.
  bank.warmUp();
  const nBins = init.config.size / 2 + 1;
  const slots: SegmentWeights[] = init.u.map((u, i) => ({
    size: init.config.size,
    df: init.config.sampleRate / init.config.size,
    u: new Float32Array(u, 0, 2 * nBins),
    cumulative: new Float64Array(init.cumulative[i], 0, nBins + 1),
    kLow: 0,
    kHigh: 0,
    scale: 0,
  }));
  const masses = init.masses;
  const count = masses.length / 2;
  const sigmaSlots = init.sigmas.map((b) => new Float64Array(b));
  const counter = new Int32Array(init.counter);
  port.on("message", (message: PoolMessage) => {
    if (message.kind === "close") {
      // Ends this worker's event loop: the thread exits as a finished program would.
      port.close();
      return;
    }
    const job: WorkerJob = message;
    try {
      const weights = slots[job.slot];
      const sigmas = sigmaSlots[job.slot];
      weights.kLow = job.kLow;
      weights.kHigh = job.kHigh;
      weights.scale = job.scale;
      const triggers: Trigger[] = [];
      const to = Math.min(job.to, count);
      for (;;) {
        const from = Atomics.add(counter, 0, job.chunk);
        if (from >= to) break;
        bank.scan(weights, masses, from, Math.min(to, from + job.chunk), job.peaks, sigmas, triggers, init.spins);
      }
      reply({ kind: "done", segment: job.segment, triggers });
    } catch (error) {
      reply(errorReply(error));
    }
  });
  reply({ kind: "ready", backend: bank.backend });
} catch (error) {
  reply(errorReply(error));
}

function errorReply(error: unknown): WorkerReply {
  return {
    kind: "error",
    message: error instanceof Error ? error.message : String(error),
    inputError: error instanceof InputError,
  };
}
