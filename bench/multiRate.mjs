// Per-template output rate benchmark (not a test), run by bench/run.mjs (or alone:
// `node bench/multiRate.mjs [--json]`; build first). Two workloads, each a fixed random subset
// of 256 templates of a bank placed by buildBank (minimal match 0.97, ajith2011), so that the
// bench takes minutes rather than hours:
//   wide: 1–30 M_sun from 20 Hz (37 661 templates placed), 1024 s of ajith2011 noise at 4096 Hz;
//   ns:   1–3 M_sun from 30 Hz, 1024 s at 4096 Hz.
// The search settings are those of bench/run.mjs (Welch median PSD from 4 s, SNR ≥ 6, χ² on).
// Measured side by side, each run preceded by its floor (the full-length inverse FFT of the
// same backend): the whole search per template-segment ÷ the floor, one thread, per-template rate
// on and off (the speed-up of one over the other); the same with 2 threads (1 → 2 scaling, whole
// run, both paths); the same 1 → 2 scaling over 4096 s (several segments, so that the pipeline
// shows: segment k + 1 prepared while the workers filter segment k) and, for the wide bank, with
// 2048 of its templates (one segment); the mean inverse-FFT length as
// a fraction of the full one; peak RSS (VmHWM) of a whole scan with the default thread count,
// per-template rate on and off, each in its own child process.
import { spawnSync } from "node:child_process";
import { readFileSync } from "node:fs";
import { availableParallelism } from "node:os";
import { performance } from "node:perf_hooks";
import { fileURLToPath } from "node:url";
import { Worker } from "node:worker_threads";
import {
  ajith2011,
  arrayInput,
  buildBank,
  chooseOutputRate,
  chooseSegmentPlan,
  colouredNoise,
  createComplexPlan,
  createSegmentFilter,
  DEFAULT_BAND_POWER_LOSS,
  loadFftBackends,
  resolveFftBackend,
  searchStrain,
  estimateSearchCost,
  taylorF2BinRange,
} from "../packages/core/dist/index.js";

const FS = 4096;
const SECONDS = 1024;
const SUBSET = 256;
/** Data (s) of the whole-run thread-scaling measurement: several segments, so the pipeline shows. */
const LONG_SECONDS = 4096;
/** Templates of the wide bank in the larger-bank thread-scaling measurement (evenly spread through it). */
const MANY = 2048;

export const WORKLOADS = {
  wide: { label: "wide bank, 1–30 M_sun from 20 Hz", massRangeSolar: [1, 30], fMinHz: 20, seed: "bench-wide" },
  ns: { label: "neutron-star bank, 1–3 M_sun from 30 Hz", massRangeSolar: [1, 3], fMinHz: 30, seed: "bench-ns" },
};

function searchOptions(templates, fMinHz, extra) {
  return {
    templates,
    fMinHz,
    snrThreshold: 6,
    chi2Bands: 16,
    loudestWithinSeconds: 1,
    psd: { kind: "estimate", segmentSeconds: 4, average: "median" },
    ...extra,
  };
}

function median(values) {
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/** mulberry32: a small seeded generator (common practice, no source). */
function seededRandom(seed) {
  let a = 0;
  for (const ch of seed) a = (Math.imul(a, 31) + ch.charCodeAt(0)) | 0;
  return () => {
    a = (a + 0x6d2b79f5) | 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** The bank of a workload and a fixed random subset of it (bank order kept). */
function workloadBank(w) {
  const t0 = performance.now();
  const bank = buildBank({ massRangeSolar: w.massRangeSolar, matchFloor: 0.97, fMinHz: w.fMinHz, psd: ajith2011 });
  const placeSeconds = (performance.now() - t0) / 1000;
  const rng = seededRandom(w.seed);
  const idx = bank.templates.map((_, i) => i);
  const count = Math.min(SUBSET, idx.length);
  for (let i = 0; i < count; i++) {
    const j = i + Math.floor(rng() * (idx.length - i));
    [idx[i], idx[j]] = [idx[j], idx[i]];
  }
  const chosen = idx.slice(0, count).sort((a, b) => a - b);
  const pick = (t) => ({ primaryMassSolar: t.primaryMassSolar, secondaryMassSolar: t.secondaryMassSolar });
  const templates = chosen.map((i) => pick(bank.templates[i]));
  const many = Array.from({ length: Math.min(MANY, bank.templates.length) }, (_, i) => pick(bank.templates[Math.floor((i * bank.templates.length) / Math.min(MANY, bank.templates.length))]));
  return { placed: bank.templates.length, placeSeconds, templates, many };
}

/** Mean inverse-FFT length ÷ the full length over the subset, and the count per length, in the model PSD. */
function rateMix(templates, fMinHz, n, data) {
  const seg = createSegmentFilter({
    size: n,
    sampleRate: FS,
    fMinHz,
    fMaxHz: 0.95 * (FS / 2),
    psd: { kind: "model", model: ajith2011 },
    truncationSamples: 2 * FS,
    backend: resolveFftBackend("auto"),
  });
  seg.load(data.slice(0, n), n);
  const w = seg.weights;
  const out = { kUse: 0, length: 0 };
  const counts = {};
  let sum = 0;
  for (const t of templates) {
    const { kStart, kEnd } = taylorF2BinRange(n / 2 + 1, FS / n, fMinHz, t.primaryMassSolar, t.secondaryMassSolar, 0.95 * (FS / 2));
    const kFrom = Math.max(kStart, w.kLow);
    const kTo = Math.min(kEnd, w.kHigh);
    chooseOutputRate(w.cumulative, kFrom, kTo, DEFAULT_BAND_POWER_LOSS, n, out);
    sum += out.length / n;
    const key = `${(FS * out.length) / n} Hz`;
    counts[key] = (counts[key] ?? 0) + 1;
  }
  seg.dispose();
  return { meanLengthFraction: sum / templates.length, complexRates: counts };
}

// ---- child mode: one whole scan, then print the peak RSS ----------------------------------------
const self = fileURLToPath(import.meta.url);
if (process.argv[1] === self && process.argv[2] === "--rss-child") {
  const [, , , key, mode, massesJson] = process.argv;
  const w = WORKLOADS[key];
  await loadFftBackends();
  const masses = JSON.parse(readFileSync(massesJson, "utf8"));
  const data = colouredNoise(ajith2011, SECONDS * FS, FS, w.seed);
  const { summary } = await searchStrain(
    arrayInput(data, FS),
    searchOptions(masses, w.fMinHz, { fftBackend: resolveFftBackend("auto"), threads: availableParallelism(), perTemplateRate: mode === "multi" }),
  );
  const status = readFileSync("/proc/self/status", "utf8");
  const hwmKb = Number(/VmHWM:\s+(\d+)/.exec(status)?.[1] ?? NaN);
  process.stdout.write(JSON.stringify({ segments: summary.segments, threads: summary.threads, peakRssMb: hwmKb / 1024 }) + "\n");
  process.exit(0);
}

/**
 * Cores this process can get right now: two worker threads spin for `seconds` and the process's
 * CPU time is divided by the wall time (2 on an idle 2-core machine; near 1 when others load it,
 * and then no 1 → 2 thread scaling can show).
 */
export async function coresAvailable(seconds = 1) {
  const code = `const t = Date.now(); let x = 0; while (Date.now() - t < ${1000 * seconds}) x += Math.sqrt(x + 1); require("node:worker_threads").parentPort.postMessage(x);`;
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  await Promise.all([0, 1].map(() => new Promise((resolve, reject) => new Worker(code, { eval: true }).on("message", resolve).on("error", reject))));
  const c = process.cpuUsage(c0);
  return (c.user + c.system) / 1e6 / ((performance.now() - t0) / 1000);
}

/**
 * Throughput of two inverse FFTs run at the same time in two worker threads ÷ that of one, per
 * complex length (pffft): what the machine's memory lets two threads gain on transforms of the
 * search's sizes, whatever the search does around them.
 */
export async function concurrentFftScaling(lengths = [1 << 18, 1 << 20, 1 << 21, 1 << 22]) {
  const coreUrl = new URL("../packages/core/dist/index.js", import.meta.url).href;
  const code = `
const { parentPort, workerData } = require("node:worker_threads");
(async () => {
  const core = await import(${JSON.stringify(coreUrl)});
  await core.loadFftBackends();
  const p = core.createComplexPlan(workerData.n, "pffft");
  for (let i = 0; i < p.input.length; i++) p.input[i] = Math.sin(i);
  p.inverse();
  const t0 = performance.now();
  for (let r = 0; r < workerData.reps; r++) p.inverse();
  parentPort.postMessage((performance.now() - t0) / workerData.reps);
})();`;
  const out = {};
  for (const n of lengths) {
    const reps = Math.max(4, Math.round(2 ** 25 / n));
    const run = (k) =>
      Promise.all(Array.from({ length: k }, () => new Promise((resolve, reject) => new Worker(code, { eval: true, workerData: { n, reps } }).on("message", resolve).on("error", reject))));
    const [one] = await run(1);
    const two = await run(2);
    out[`2^${Math.log2(n)}`] = (2 * one) / Math.max(...two);
  }
  return out;
}

/** Runs both workloads; `log` prints progress lines. Returns the figures. */
export async function rateWorkloads(log, { rounds = 2 } = {}) {
  await loadFftBackends();
  const backend = resolveFftBackend("auto");
  const { writeFileSync, mkdtempSync, rmSync } = await import("node:fs");
  const { tmpdir } = await import("node:os");
  const { join } = await import("node:path");
  const dir = mkdtempSync(join(tmpdir(), "chirpsieve-bench-"));
  const results = {};
  results.concurrentFft = await concurrentFftScaling();
  log(`two concurrent inverse FFTs ÷ one, by complex length: ${JSON.stringify(Object.fromEntries(Object.entries(results.concurrentFft).map(([k, v]) => [k, Number(v.toFixed(2))])))}`);
  try {
    for (const [key, w] of Object.entries(WORKLOADS)) {
      log(`${w.label}: placing the bank…`);
      const { placed, placeSeconds, templates, many } = workloadBank(w);
      const data = colouredNoise(ajith2011, SECONDS * FS, FS, w.seed);
      const plan = chooseSegmentPlan(searchOptions(templates, w.fMinHz), FS, data.length);
      const n = plan.size;
      const mix = rateMix(templates, w.fMinHz, n, data);
      log(
        `  ${placed} templates placed in ${placeSeconds.toFixed(1)} s; ${templates.length} searched over ${plan.segments.length} segment(s) of 2^${Math.log2(n)}; ` +
          `mean inverse-FFT length ${mix.meanLengthFraction.toFixed(3)} of the full one (${JSON.stringify(mix.complexRates)})`,
      );
      const floorPlan = createComplexPlan(n, backend);
      for (let i = 0; i < floorPlan.input.length; i++) floorPlan.input[i] = Math.sin(i);
      floorPlan.inverse();
      const floorMs = () => {
        const walls = [];
        for (let r = 0; r < 7; r++) {
          const t0 = performance.now();
          floorPlan.inverse();
          walls.push(performance.now() - t0);
        }
        return median(walls);
      };
      const configs = [
        { key: "multi1", label: "per-template rate, 1 thread", extra: { threads: 1 } },
        { key: "single1", label: "full rate, 1 thread", extra: { threads: 1, perTemplateRate: false } },
        { key: "multi2", label: "per-template rate, 2 threads", extra: { threads: 2 } },
        { key: "single2", label: "full rate, 2 threads", extra: { threads: 2, perTemplateRate: false } },
      ];
      const samples = configs.map(() => ({ walls: [], ratios: [], floors: [] }));
      let segments = 0;
      const cores = [];
      for (let r = 0; r < rounds; r++) {
        cores.push(await coresAvailable());
        for (const [c, cfg] of configs.entries()) {
          const floor = floorMs();
          const t0 = performance.now();
          const res = await searchStrain(arrayInput(data, FS), searchOptions(templates, w.fMinHz, { fftBackend: backend, ...cfg.extra }));
          const wall = (performance.now() - t0) / 1000;
          segments = res.summary.segments;
          samples[c].walls.push(wall);
          samples[c].floors.push(floor);
          samples[c].ratios.push((1000 * wall) / (templates.length * segments) / floor);
        }
      }
      cores.push(await coresAvailable());
      floorPlan.dispose();
      log(`  cores available to two spinning threads before, between and after the rounds: ${cores.map((c) => c.toFixed(2)).join(", ")}`);
      const runs = {};
      configs.forEach((cfg, c) => {
        runs[cfg.key] = {
          label: cfg.label,
          wallSeconds: median(samples[c].walls),
          floorMs: median(samples[c].floors),
          perTemplateSegmentMs: (1000 * median(samples[c].walls)) / (templates.length * segments),
          ratioToFloor: median(samples[c].ratios),
        };
        log(`  ${cfg.label}: ${runs[cfg.key].wallSeconds.toFixed(2)} s = ${runs[cfg.key].ratioToFloor.toFixed(3)} × the full-rate inverse FFT (${runs[cfg.key].floorMs.toFixed(2)} ms) per template-segment`);
      });
      const massesFile = join(dir, `${key}.json`);
      writeFileSync(massesFile, JSON.stringify(templates));
      const rss = {};
      for (const mode of ["multi", "single"]) {
        const r = spawnSync(process.execPath, [self, "--rss-child", key, mode, massesFile], { encoding: "utf8" });
        if (r.status !== 0) throw new Error(`rss child (${key}, ${mode}) failed: ${r.stderr}`);
        rss[mode] = JSON.parse(r.stdout.trim().split("\n").pop());
      }
      // Whole-run 1 → 2 thread scaling over several segments (the pipeline: segment k + 1 prepared
      // while the workers filter segment k), per-template rate on, alternating 1 and 2 threads.
      const long = colouredNoise(ajith2011, LONG_SECONDS * FS, FS, `${w.seed}-long`);
      const longWalls = { 1: [], 2: [] };
      let longSegments = 0;
      for (let r = 0; r < rounds; r++) {
        for (const threads of [1, 2]) {
          const t0 = performance.now();
          const res = await searchStrain(arrayInput(long, FS), searchOptions(templates, w.fMinHz, { fftBackend: backend, threads }));
          longWalls[threads].push((performance.now() - t0) / 1000);
          longSegments = res.summary.segments;
        }
      }
      const longScaling = { seconds: LONG_SECONDS, segments: longSegments, oneThreadSeconds: median(longWalls[1]), twoThreadSeconds: median(longWalls[2]) };
      longScaling.oneToTwoThreads = longScaling.oneThreadSeconds / longScaling.twoThreadSeconds;
      log(`  ${LONG_SECONDS} s (${longSegments} segments): 1 thread ${longScaling.oneThreadSeconds.toFixed(2)} s, 2 threads ${longScaling.twoThreadSeconds.toFixed(2)} s = ${longScaling.oneToTwoThreads.toFixed(2)}×`);
      // The same 1 → 2 scaling with a larger share of the bank (wide only: 2048 templates, one
      // segment): the per-segment preparation before the workers have work weighs 8× less.
      let manyScaling;
      if (key === "wide") {
        const walls = { 1: [], 2: [] };
        for (const threads of [1, 2]) {
          const t0 = performance.now();
          await searchStrain(arrayInput(data, FS), searchOptions(many, w.fMinHz, { fftBackend: backend, threads }));
          walls[threads].push((performance.now() - t0) / 1000);
        }
        manyScaling = { templates: many.length, seconds: SECONDS, oneThreadSeconds: walls[1][0], twoThreadSeconds: walls[2][0] };
        manyScaling.oneToTwoThreads = manyScaling.oneThreadSeconds / manyScaling.twoThreadSeconds;
        log(`  ${many.length} templates, ${SECONDS} s: 1 thread ${manyScaling.oneThreadSeconds.toFixed(2)} s, 2 threads ${manyScaling.twoThreadSeconds.toFixed(2)} s = ${manyScaling.oneToTwoThreads.toFixed(2)}×`);
      }
      log(`  peak RSS, ${rss.multi.threads} threads: per-template rate ${rss.multi.peakRssMb.toFixed(0)} MB, full rate ${rss.single.peakRssMb.toFixed(0)} MB`);
      // The cost model bank sweep uses (search/searchCost.ts), against the timed one-thread search of the same templates.
      const estimate = estimateSearchCost({ templates, fMinHz: w.fMinHz, sampleRate: FS, psd: ajith2011, backend, dataSeconds: SECONDS });
      const estimatedSeconds = segments * (estimate.perSegmentSeconds + templates.length * estimate.perTemplateSegmentSeconds);
      log(`  cost model: ${estimatedSeconds.toFixed(2)} s estimated for this search, ${runs.multi1.wallSeconds.toFixed(2)} s measured (ratio ${(estimatedSeconds / runs.multi1.wallSeconds).toFixed(2)})`);
      results[key] = {
        label: w.label,
        costModel: { estimatedSeconds, measuredSeconds: runs.multi1.wallSeconds, ratio: estimatedSeconds / runs.multi1.wallSeconds, cpuSecondsPerHour: estimate.cpuSecondsPerHour },
        bankTemplates: placed,
        searchedTemplates: templates.length,
        segments,
        segmentSamples: n,
        ...mix,
        runs,
        ratioToFloor: runs.multi1.ratioToFloor,
        fullRateRatioToFloor: runs.single1.ratioToFloor,
        speedupOverFullRate: runs.single1.wallSeconds / runs.multi1.wallSeconds,
        oneToTwoThreads: runs.multi1.wallSeconds / runs.multi2.wallSeconds,
        longScaling,
        ...(manyScaling ? { manyScaling } : {}),
        fullRateOneToTwoThreads: runs.single1.wallSeconds / runs.single2.wallSeconds,
        coresAvailable: cores,
        peakRssMb: { perTemplateRate: rss.multi.peakRssMb, fullRate: rss.single.peakRssMb, threads: rss.multi.threads },
        target: key === "wide" ? 0.5 : 0.8,
      };
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  return results;
}

/** The printed lines of {@link rateWorkloads}' figures. */
export function rateLines(results) {
  const lines = [`8. per-template output rate (${SUBSET} templates of a placed bank, ${SECONDS} s at ${FS} Hz, pffft when loaded; whole search per template-segment ÷ the full-rate inverse FFT):`];
  for (const [key, r] of Object.entries(results)) {
    if (key === "concurrentFft") {
      lines.push(`   two inverse FFTs at once in two threads ÷ one (the memory's limit on 1 → 2 threads): ${Object.entries(r).map(([k, v]) => `${k} ${v.toFixed(2)}×`).join(", ")}`);
      continue;
    }
    lines.push(
      `   ${r.label}: ${r.ratioToFloor.toFixed(3)} × (target ≤ ${r.target}); full rate ${r.fullRateRatioToFloor.toFixed(3)} ×; speed-up ${r.speedupOverFullRate.toFixed(2)}×; ` +
        `1 → 2 threads ${r.oneToTwoThreads.toFixed(2)}× over ${r.segments} segment(s), ${r.longScaling.oneToTwoThreads.toFixed(2)}× over ${r.longScaling.segments} segments of ${r.longScaling.seconds} s${r.manyScaling ? `, ${r.manyScaling.oneToTwoThreads.toFixed(2)}× with ${r.manyScaling.templates} templates` : ""} (target ≥ 1.85×; full rate ${r.fullRateOneToTwoThreads.toFixed(2)}×; cores available ${Math.min(...r.coresAvailable).toFixed(2)}–${Math.max(...r.coresAvailable).toFixed(2)}); mean FFT length ${r.meanLengthFraction.toFixed(3)}; ` +
        `peak RSS ${r.peakRssMb.perTemplateRate.toFixed(0)} MB (full rate ${r.peakRssMb.fullRate.toFixed(0)} MB); ` +
        `cost model (bank sweep's estimate) ÷ the timed search ${r.costModel.ratio.toFixed(2)} (target within 1/1.5–1.5)`,
    );
  }
  return lines;
}

if (process.argv[1] === self && process.argv[2] !== "--rss-child") {
  const json = process.argv.includes("--json");
  const results = await rateWorkloads((line) => {
    if (!json) process.stderr.write(line + "\n");
  });
  process.stdout.write(json ? JSON.stringify(results, null, 2) + "\n" : rateLines(results).join("\n") + "\n");
}
