// Search throughput benchmark (not a test): prints figures and ratios, text or `--json`.
// It imports the BUILT core, so build first: `npx tsc -b packages/core` (or `npm run build`),
// then `npm run bench` (= `node bench/run.mjs`; add `-- --json` for JSON).
//
// Workload (synthetic): 1024 s at 4096 Hz of seeded ajith2011 coloured noise, a fixed list of 64
// templates over 1–3 M_sun from 30 Hz, PSD estimated per segment (Welch, median, 4 s), SNR ≥ 6,
// chi-squared on. That gives 3 segments of 2^21 samples (512 s), the default plan for these
// templates. Every figure is the median of several repeats in this one run; the configurations
// are run in turn and each ratio is taken against a floor measured right beside it, because on a
// shared machine the speed drifts within seconds. Reported:
//   1. the bare inverse FFT of one segment per backend (the floor of a template-segment);
//   2. the search's wall time per template-segment and its ratio to the floor (one thread), and
//      the per-template kernel alone (phase product, inverse FFT, peaks) against the bare FFT;
//   3. the speed-up of the default configuration (auto backend, threads = cores) over fft.js
//      with one thread;
//   4. the scaling from 1 to 2 threads and to the number of cores (whole scan, and from the end
//      of the first segment on, i.e. without starting the workers and preparing segment one);
//   5. the peak RSS (VmHWM) of scans of a 1024 s and a 16× longer input (8 templates, default
//      backend and thread count), each in its own child process, inputs synthesised as read;
//   0. the README demo's whole command, the CLI's start-up (`chirpsieve --help`), and the README's
//      injection campaign (`recover`, 200 injections) with one and two threads;
//   6. seconds of data searched per wall-clock second (for the bank, and per template);
//   7. template banks: placing 1–3 M_sun from 30 Hz at minimal match 0.97, verifying it with 1000
//      TaylorF2 draws against each draw's neighbours, and the speed-up of that over comparing a few
//      draws with every template (measured side by side);
//   8. the per-template output rate on placed banks (bench/multiRate.mjs): a wide 1–30 M_sun bank
//      from 20 Hz and a neutron-star bank, each a fixed random subset of 256 templates over 1024 s.
// The templates above (items 1–6) are filtered at the per-template rate, the default.
// `--rates-only` runs item 8 alone.
import { spawnSync } from "node:child_process";
import { readFileSync } from "node:fs";
import { availableParallelism } from "node:os";
import { performance } from "node:perf_hooks";
import { fileURLToPath } from "node:url";
import {
  ajith2011,
  arrayInput,
  buildBankWithReport,
  chooseSegmentPlan,
  colouredNoise,
  createBankFilter,
  createComplexPlan,
  createNoiseStream,
  createSegmentFilter,
  loadFftBackends,
  resolveFftBackend,
  searchStrain,
  verifyBank,
  amplitudeLaw,
  createTaylorF2Phasor,
  taylorF2Amplitude,
  taylorF2BinRange,
} from "../packages/core/dist/index.js";
import { coresAvailable, rateLines, rateWorkloads } from "./multiRate.mjs";

const FS = 4096;
const SECONDS = 1024;
const F_MIN = 30;
const args = process.argv.slice(2);

/** 64 fixed templates over 1–3 M_sun (m1 ≥ m2), spread in both masses by golden-ratio steps. */
function benchTemplates(count = 64) {
  const out = [];
  for (let i = 0; i < count; i++) {
    const m1 = 1 + 2 * ((i + 0.5) / count);
    const m2 = 1 + (m1 - 1) * ((0.5 + i * 0.6180339887) % 1);
    out.push({ primaryMassSolar: m1, secondaryMassSolar: m2 });
  }
  return out;
}

function searchOptions(templates, extra) {
  return {
    templates,
    fMinHz: F_MIN,
    snrThreshold: 6,
    chi2Bands: 16,
    loudestWithinSeconds: 1,
    psd: { kind: "estimate", segmentSeconds: 4, average: "median" },
    ...extra,
  };
}

/**
 * Cost of generating aligned-spin templates by the fast phase path, against the same templates
 * without spins: 64 templates over 1–3 M_sun from 30 Hz on a 2^21-sample grid at 4096 Hz, spins
 * (0.4, −0.2), the two kinds timed in turn, median of 5 passes each (target ≤ 1.5×).
 */
function spinningTemplateCost() {
  const n = 1 << 21;
  const nBins = n / 2 + 1;
  const df = FS / n;
  const law = amplitudeLaw(nBins, df);
  const phasor = createTaylorF2Phasor(df);
  const out = new Float64Array(2 * nBins);
  const list = benchTemplates(64);
  const pass = (chi1, chi2) => {
    const t0 = performance.now();
    for (const t of list) {
      const { kStart, kEnd } = taylorF2BinRange(nBins, df, F_MIN, t.primaryMassSolar, t.secondaryMassSolar);
      phasor.template(law, out, kStart, kEnd, t.primaryMassSolar, t.secondaryMassSolar, taylorF2Amplitude(t.primaryMassSolar, t.secondaryMassSolar, 1), chi1, chi2);
    }
    return (performance.now() - t0) / list.length;
  };
  pass(0, 0);
  pass(0.4, -0.2);
  const plain = [];
  const spinning = [];
  for (let i = 0; i < 5; i++) {
    plain.push(pass(0, 0));
    spinning.push(pass(0.4, -0.2));
  }
  const a = median(plain);
  const b = median(spinning);
  return { nonSpinningMsPerTemplate: a, spinningMsPerTemplate: b, ratio: b / a, target: 1.5 };
}

function median(values) {
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/**
 * A SearchInput of seeded coloured noise made as it is read: the search reads segments in
 * increasing order with overlaps (after one screening pass over the whole input, which starts the
 * stream again), so only the samples from the last read on are kept, in one
 * buffer that is reused (the returned copy is the only allocation per read besides the stream's).
 */
function streamedNoise(seconds, seed) {
  let stream = createNoiseStream({ psd: ajith2011, sampleRate: FS, seed });
  let buffer = new Float64Array(0);
  let bufferStart = 0; // series index of buffer[0]
  let filled = 0; // valid samples in buffer
  return {
    file: `<synthetic ${seconds} s>`,
    sampleRate: FS,
    startTime: 0,
    length: seconds * FS,
    async read(offset, count) {
      if (offset < bufferStart) {
        // The search screens the whole input before its segments: start the same stream again.
        stream = createNoiseStream({ psd: ajith2011, sampleRate: FS, seed });
        bufferStart = 0;
        filled = 0;
      }
      const drop = Math.min(filled, offset - bufferStart);
      buffer.copyWithin(0, drop, filled);
      filled -= drop;
      bufferStart += drop;
      if (offset > bufferStart) {
        stream.next(offset - bufferStart); // a gap: make and drop the samples in between
        bufferStart = offset;
      }
      if (buffer.length < count) {
        const bigger = new Float64Array(count);
        bigger.set(buffer.subarray(0, filled));
        buffer = bigger;
      }
      if (filled < count) {
        buffer.set(stream.next(count - filled), filled);
        filled = count;
      }
      return buffer.slice(0, count);
    },
  };
}

// ---- child mode: one scan of a streamed input, then print the peak RSS ------------------------
if (args[0] === "--rss-child") {
  const seconds = Number(args[1]);
  await loadFftBackends();
  const { summary } = await searchStrain(
    streamedNoise(seconds, "bench-rss"),
    // The default backend and thread count (given explicitly: the default drops to one thread
    // for small jobs, and both inputs must run alike).
    searchOptions(benchTemplates(8), { fftBackend: resolveFftBackend("auto"), threads: availableParallelism() }),
  );
  const status = readFileSync("/proc/self/status", "utf8");
  const hwmKb = Number(/VmHWM:\s+(\d+)/.exec(status)?.[1] ?? NaN);
  process.stdout.write(JSON.stringify({ seconds, segments: summary.segments, threads: summary.threads, peakRssMb: hwmKb / 1024 }) + "\n");
  process.exit(0);
}

// ---- main mode ----------------------------------------------------------------------------------
const json = args.includes("--json");
const log = (line) => {
  if (!json) process.stderr.write(line + "\n");
};
if (args.includes("--rates-only")) {
  const rates = await rateWorkloads(log);
  process.stdout.write(json ? JSON.stringify({ rates }, null, 2) + "\n" : rateLines(rates).join("\n") + "\n");
  process.exit(0);
}
await loadFftBackends();
const cores = availableParallelism();
const templates = benchTemplates();
log(`chirpsieve search bench: node ${process.version}, ${cores} cores; building ${SECONDS} s of ajith2011 noise at ${FS} Hz…`);
const data = colouredNoise(ajith2011, SECONDS * FS, FS, "bench-search");
const segmentPlan = chooseSegmentPlan(searchOptions(templates), FS, data.length);
const n = segmentPlan.size;
const segments = segmentPlan.segments.length;

// 1. The floor: inverse FFTs of the segment length. On a shared machine the speed drifts by
// factors within seconds, so every ratio below compares times taken side by side: the floor is
// re-measured right before each search run, and the per-template kernel alternates with it.
const floorPlans = { pffft: createComplexPlan(n, "pffft"), fftjs: createComplexPlan(n, "fftjs") };
for (const plan of Object.values(floorPlans)) {
  const input = plan.input;
  for (let i = 0; i < input.length; i++) input[i] = Math.sin(i);
  plan.inverse();
}
/** Median wall time (ms) of `repeats` inverse FFTs of the segment length. */
function timeFloor(backend, repeats) {
  const plan = floorPlans[backend];
  const walls = [];
  for (let r = 0; r < repeats; r++) {
    const t0 = performance.now();
    plan.inverse();
    walls.push(performance.now() - t0);
  }
  return median(walls);
}
const floor = { pffft: timeFloor("pffft", 15), fftjs: timeFloor("fftjs", 5) };
log(`  inverse FFT of 2^${Math.log2(n)} points: pffft ${floor.pffft.toFixed(2)} ms, fftjs ${floor.fftjs.toFixed(2)} ms`);

// The per-template kernel on the first segment (noise-curve PSD): phase product + inverse FFT +
// peak finding, alternating template by template with a bare inverse FFT.
function kernelRatio(backend) {
  const filter = createSegmentFilter({
    size: n,
    sampleRate: FS,
    fMinHz: F_MIN,
    fMaxHz: 0.95 * (FS / 2),
    psd: { kind: "model", model: ajith2011 },
    truncationSamples: 2 * FS,
    backend,
  });
  filter.load(data.slice(0, n), n);
  const bank = createBankFilter({ size: n, sampleRate: FS, fMinHz: F_MIN, fMaxHz: 0.95 * (FS / 2), backend });
  const masses = new Float64Array(templates.flatMap((t) => [t.primaryMassSolar, t.secondaryMassSolar]));
  const sigmas = new Float64Array(templates.length);
  const peaks = { start: segmentPlan.invalidStart, end: n - segmentPlan.invalidEnd, threshold: 6, window: FS };
  const count = backend === "pffft" ? templates.length : 8;
  bank.scan(filter.weights, masses, 0, 1, peaks, sigmas, []); // warm-up
  let fft = 0;
  let kernel = 0;
  for (let i = 0; i < count; i++) {
    const t0 = performance.now();
    floorPlans[backend].inverse();
    const t1 = performance.now();
    bank.scan(filter.weights, masses, i, i + 1, peaks, sigmas, []);
    kernel += performance.now() - t1;
    fft += t1 - t0;
  }
  bank.dispose();
  filter.dispose();
  return { floorMs: fft / count, kernelMs: kernel / count, ratio: kernel / fft };
}
const kernel = { pffft: kernelRatio("pffft"), fftjs: kernelRatio("fftjs") };
for (const [b, k] of Object.entries(kernel)) {
  log(`  per-template kernel, ${b}: ${k.kernelMs.toFixed(2)} ms beside ${k.floorMs.toFixed(2)} ms for the bare inverse FFT = ${k.ratio.toFixed(3)} × floor`);
}

/**
 * Times searches of the workload under several configurations, `repeats` rounds taking each
 * configuration in turn (so that a drift in the machine's speed falls on all of them alike); each
 * search is preceded by a fresh measurement of its backend's floor. Medians per configuration.
 */
async function timeSearches(configs, repeats) {
  const samples = configs.map(() => ({ walls: [], cpus: [], ratios: [], steady: [] }));
  const last = [];
  for (let r = 0; r < repeats; r++) {
    for (const [c, { extra, subset = templates, rounds = repeats }] of configs.entries()) {
      if (r >= rounds) continue;
      const before = timeFloor(extra.fftBackend, extra.fftBackend === "pffft" ? 7 : 3);
      const cpu0 = process.cpuUsage();
      const t0 = performance.now();
      const marks = [];
      const onProgress = () => marks.push(performance.now());
      const result = await searchStrain(arrayInput(data, FS), searchOptions(subset, { ...extra, onProgress }));
      const wall = (performance.now() - t0) / 1000;
      // Time from the first segment's end to the last's: the steady state, without start-up
      // (worker threads, the first segment's read and PSD, which nothing can overlap).
      samples[c].steady.push((marks[marks.length - 1] - marks[0]) / 1000);
      const cpu = process.cpuUsage(cpu0);
      samples[c].walls.push(wall);
      samples[c].cpus.push((cpu.user + cpu.system) / 1e6);
      samples[c].ratios.push((1000 * wall) / (subset.length * result.summary.segments) / before);
      last[c] = result;
    }
  }
  return configs.map(({ label, subset = templates }, c) => {
    const { summary, candidates } = last[c];
    const wall = median(samples[c].walls);
    const row = {
      label,
      backend: summary.fftBackend,
      threads: summary.threads,
      templates: subset.length,
      segments: summary.segments,
      wallSeconds: wall,
      perTemplateSegmentMs: (1000 * wall) / (subset.length * summary.segments),
      ratioToFloor: median(samples[c].ratios),
      steadySeconds: median(samples[c].steady),
      cpuCoresBusy: median(samples[c].cpus) / wall,
      analysedSeconds: summary.analysedSeconds,
      candidates: candidates.length,
    };
    log(
      `  ${label}: ${wall.toFixed(2)} s (median of ${samples[c].walls.length}); ${row.perTemplateSegmentMs.toFixed(2)} ms per template-segment ` +
        `= ${row.ratioToFloor.toFixed(2)} × floor; ${row.cpuCoresBusy.toFixed(2)} cores busy`,
    );
    return row;
  });
}

log(`searching ${templates.length} templates × ${segments} segments of 2^${Math.log2(n)} samples…`);
const runs = {};
// The same with a known noise curve: no Welch estimate per segment, so what is left beside the
// inverse FFTs is the per-template work (phase product, peaks) and the forward FFT.
// fft.js is ~8× slower: one round only, over the same bank (so that the per-segment work weighs
// the same in both).
const model = { kind: "model", model: ajith2011 };
const configs = [
  { key: "pffft1", label: "pffft, 1 thread", extra: { fftBackend: "pffft", threads: 1 } },
  { key: "pffft2", label: "pffft, 2 threads", extra: { fftBackend: "pffft", threads: 2 } },
  { key: "pffft1Model", label: "pffft, 1 thread, noise curve", extra: { fftBackend: "pffft", threads: 1, psd: model } },
  { key: "fftjs1", label: "fftjs, 1 thread", extra: { fftBackend: "fftjs", threads: 1 }, rounds: 1 },
];
if (cores > 2) configs.push({ key: "pffftCores", label: `pffft, ${cores} threads`, extra: { fftBackend: "pffft", threads: cores } });
const coresBefore = await coresAvailable();
(await timeSearches(configs, 3)).forEach((row, i) => {
  runs[configs[i].key] = row;
});
runs.default = cores > 2 ? runs.pffftCores : runs.pffft2;
const defaultBackend = resolveFftBackend("auto");
for (const plan of Object.values(floorPlans)) plan.dispose();

// 5. Peak RSS of a short and a 16× longer scan, each in a child process of its own.
const self = fileURLToPath(import.meta.url);
function rssChild(seconds) {
  const r = spawnSync(process.execPath, [self, "--rss-child", String(seconds)], { encoding: "utf8" });
  if (r.status !== 0) throw new Error(`rss child (${seconds} s) failed: ${r.stderr}`);
  return JSON.parse(r.stdout.trim().split("\n").pop());
}
log("peak RSS of scans of a short and a 16× longer streamed input (8 templates, default threads)…");
// The short input is the main workload's length (3 segments): with worker threads the next
// segment is read and its PSD estimated while the workers filter the current one, so a
// one-segment input would not show the steady state.
const rssShort = rssChild(SECONDS);
const rssLong = rssChild(16 * SECONDS);
log(`  ${rssShort.seconds} s: ${rssShort.peakRssMb.toFixed(0)} MB; ${rssLong.seconds} s: ${rssLong.peakRssMb.toFixed(0)} MB`);

// The README's demo (`npm run demo`): the whole command, CLI start-up and bank placement included
// (target: under a minute on a 2-core machine). Median of 3 runs.
const demoScript = JSON.parse(readFileSync(new URL("../package.json", import.meta.url), "utf8")).scripts.demo;
const demoArgs = demoScript.split(/\s+/).slice(1);
const demoRoot = fileURLToPath(new URL("..", import.meta.url));
const demoTimes = [];
for (let r = 0; r < 3; r++) {
  const t0 = performance.now();
  const d = spawnSync(process.execPath, demoArgs, { cwd: demoRoot, encoding: "utf8" });
  if (d.status !== 0) throw new Error(`demo failed: ${d.stderr}`);
  demoTimes.push((performance.now() - t0) / 1000);
}
demoTimes.sort((a, b) => a - b);
log(`  demo (${demoScript}): ${demoTimes[1].toFixed(1)} s (median of 3)`);
// CLI start-up: `chirpsieve --help` (module loading; the plot libraries load only when asked for).
const startTimes = [];
for (let r = 0; r < 5; r++) {
  const t0 = performance.now();
  const h = spawnSync(process.execPath, ["packages/cli/dist/main.js", "--help"], { cwd: demoRoot, encoding: "utf8" });
  if (h.status !== 0) throw new Error(`chirpsieve --help failed: ${h.stderr}`);
  startTimes.push((performance.now() - t0) / 1000);
}
startTimes.sort((a, b) => a - b);
log(`  CLI start-up (chirpsieve --help): ${startTimes[2].toFixed(2)} s (median of 5)`);
// The README's campaign (200 injections in 14 batches of simulated noise), one and two threads:
// its batches run as one pipelined search (the next batch made and loaded while the workers
// filter the last), so 1 → 2 threads should hold for the whole campaign.
const recoverArgs = ["packages/cli/dist/main.js", "recover", "--noise-curve", "ajith2011", "--count", "200", "--mass-range", "1.3:1.5", "--snr-range", "5:20", "--seed", "11", "--fmin", "40", "--min-snr", "7", "--quiet"];
const recoverSeconds = {};
{
  const { mkdtempSync, rmSync } = await import("node:fs");
  const { tmpdir } = await import("node:os");
  const { join } = await import("node:path");
  const dir = mkdtempSync(join(tmpdir(), "chirpsieve-bench-recover-"));
  try {
    for (const threads of [1, 2]) {
      const t0 = performance.now();
      const r = spawnSync(process.execPath, [...recoverArgs, "--threads", String(threads), "--out", join(dir, `r${threads}.json`)], { cwd: demoRoot, encoding: "utf8" });
      if (r.status !== 0) throw new Error(`recover failed: ${r.stderr}`);
      recoverSeconds[threads] = (performance.now() - t0) / 1000;
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
log(`  recover (README campaign): 1 thread ${recoverSeconds[1].toFixed(1)} s, 2 threads ${recoverSeconds[2].toFixed(1)} s`);

log("template bank: placement, neighbour verification, and a few draws against the whole bank…");
const bankSettings = { massRangeSolar: [1, 3], matchFloor: 0.97, fMinHz: 30, psd: ajith2011 };
const tPlace = performance.now();
const placed = buildBankWithReport(bankSettings);
const placeSeconds = (performance.now() - tPlace) / 1000;
const verified = verifyBank(placed.bank, { draws: 1000, seed: "bench", psd: ajith2011 });
const exhaustiveDraws = 8;
const brute = verifyBank(placed.bank, { draws: exhaustiveDraws, seed: "bench", psd: ajith2011, exhaustive: true });
const bankFigures = {
  templates: placed.report.templateCount,
  placeSeconds,
  verifyDraws: verified.draws,
  verifySeconds: verified.wallTimeMs / 1000,
  matchesPerDraw: verified.matchesPerDraw,
  exhaustiveSecondsPerDraw: brute.wallTimeMs / 1000 / exhaustiveDraws,
  speedupOverExhaustive: brute.wallTimeMs / exhaustiveDraws / (verified.wallTimeMs / verified.draws),
  coverage: verified.fractionAboveMinimalMatch,
};
log(`  ${bankFigures.templates} templates placed in ${placeSeconds.toFixed(1)} s; 1000 draws verified in ${bankFigures.verifySeconds.toFixed(1)} s`);

log("per-template output rate on placed banks (256 templates each)…");
const rates = await rateWorkloads(log);

const spinCost = spinningTemplateCost();
const figures = {
  spinningTemplateCost: spinCost,
  demoWallSeconds: { median: demoTimes[1], target: 60 },
  recoverSeconds: { oneThread: recoverSeconds[1], twoThreads: recoverSeconds[2], oneToTwo: recoverSeconds[1] / recoverSeconds[2] },
  cliStartSeconds: startTimes[2],
  bank: bankFigures,
  rates,
  machine: { node: process.version, cores, note: "the machine may be shared; rerun on a quiet one for the record" },
  workload: {
    seconds: SECONDS,
    sampleRate: FS,
    fMinHz: F_MIN,
    templates: templates.length,
    massRangeSolar: [1, 3],
    segments,
    segmentSamples: n,
    psd: "Welch median estimate per segment (4 s)",
  },
  floorMsPerTemplateSegment: floor,
  kernel,
  runs,
  ratioToFloor: {
    pffft1: runs.pffft1.ratioToFloor,
    pffft1Model: runs.pffft1Model.ratioToFloor,
    fftjs1: runs.fftjs1.ratioToFloor,
    kernelPffft: kernel.pffft.ratio,
    kernelFftjs: kernel.fftjs.ratio,
    target: 1.3,
  },
  speedupDefaultOverFftjs1: {
    value: runs.fftjs1.perTemplateSegmentMs / runs.default.perTemplateSegmentMs,
    default: `${defaultBackend}, ${runs.default.threads} threads`,
    target: 5,
  },
  threadScaling: {
    oneToTwo: runs.pffft1.wallSeconds / runs.pffft2.wallSeconds,
    oneToCores: runs.pffft1.wallSeconds / runs.default.wallSeconds,
    oneToTwoAfterFirstSegment: runs.pffft1.steadySeconds / runs.pffft2.steadySeconds,
    cores,
    coresAvailableBefore: coresBefore,
    target: 1.8,
  },
  peakRss: {
    shortSeconds: rssShort.seconds,
    shortMb: rssShort.peakRssMb,
    longSeconds: rssLong.seconds,
    longMb: rssLong.peakRssMb,
    ratio: rssLong.peakRssMb / rssShort.peakRssMb,
    threads: rssLong.threads,
    target: 1.2,
  },
  dataSecondsPerWallSecond: {
    bank: runs.default.analysedSeconds / runs.default.wallSeconds,
    perTemplate: (runs.default.analysedSeconds * templates.length) / runs.default.wallSeconds,
    onePffftThreadPerTemplate: (runs.pffft1.analysedSeconds * templates.length) / runs.pffft1.wallSeconds,
  },
};

if (json) {
  process.stdout.write(JSON.stringify(figures, null, 2) + "\n");
} else {
  const f = figures;
  const lines = [
    "",
    `chirpsieve search bench — ${SECONDS} s at ${FS} Hz, ${templates.length} templates (1–3 M_sun from ${F_MIN} Hz), ${segments} segments of 2^${Math.log2(n)}; node ${process.version}, ${cores} cores`,
    `0. the README demo (npm run demo, whole command): ${f.demoWallSeconds.median.toFixed(1)} s (target < 60 s); CLI start-up ${f.cliStartSeconds.toFixed(2)} s; ` +
      `the README campaign (recover, 200 injections): 1 thread ${f.recoverSeconds.oneThread.toFixed(1)} s, 2 threads ${f.recoverSeconds.twoThreads.toFixed(1)} s = ${f.recoverSeconds.oneToTwo.toFixed(2)}×`,
    `1. floor, inverse FFT per template-segment: pffft ${floor.pffft.toFixed(2)} ms, fftjs ${floor.fftjs.toFixed(2)} ms`,
    `2. search per template-segment, 1 thread, and its ratio to the floor measured beside it (target ≤ 1.3):`,
    `   pffft, PSD estimated per segment: ${runs.pffft1.perTemplateSegmentMs.toFixed(2)} ms = ${f.ratioToFloor.pffft1.toFixed(2)} × floor`,
    `   pffft, noise curve:               ${runs.pffft1Model.perTemplateSegmentMs.toFixed(2)} ms = ${f.ratioToFloor.pffft1Model.toFixed(2)} × floor`,
    `   fftjs, PSD estimated per segment: ${runs.fftjs1.perTemplateSegmentMs.toFixed(2)} ms = ${f.ratioToFloor.fftjs1.toFixed(2)} × floor`,
    `   per-template kernel alone (phase product + inverse FFT + peaks): pffft ${f.ratioToFloor.kernelPffft.toFixed(3)}, fftjs ${f.ratioToFloor.kernelFftjs.toFixed(3)} × floor`,
    `3. default (${f.speedupDefaultOverFftjs1.default}) over fftjs with 1 thread: ${f.speedupDefaultOverFftjs1.value.toFixed(2)}× (target ≥ 5×)`,
    `4. threads: 1 → 2 ${f.threadScaling.oneToTwo.toFixed(2)}× (target ≥ 1.8×), ${f.threadScaling.oneToTwoAfterFirstSegment.toFixed(2)}× after the first segment;` +
      ` 1 → ${cores} cores ${f.threadScaling.oneToCores.toFixed(2)}×` +
      `; cores busy: 1 thread ${runs.pffft1.cpuCoresBusy.toFixed(2)}, ${runs.default.threads} threads ${runs.default.cpuCoresBusy.toFixed(2)}` +
      ` (two spinning threads got ${coresBefore.toFixed(2)} cores just before)`,
    `5. peak RSS: ${rssShort.seconds} s ${rssShort.peakRssMb.toFixed(0)} MB, ${rssLong.seconds} s ${rssLong.peakRssMb.toFixed(0)} MB, ratio ${f.peakRss.ratio.toFixed(2)} (target ≤ 1.2)`,
    `6. data searched per wall second: ${f.dataSecondsPerWallSecond.bank.toFixed(1)} s for the ${templates.length}-template bank` +
      ` = ${f.dataSecondsPerWallSecond.perTemplate.toFixed(0)} s per template (default); ${f.dataSecondsPerWallSecond.onePffftThreadPerTemplate.toFixed(0)} s per template on one pffft thread`,
    `7. bank 1–3 M_sun from 30 Hz, MM 0.97: ${f.bank.templates} templates placed in ${f.bank.placeSeconds.toFixed(1)} s; ` +
      `${f.bank.verifyDraws} draws verified in ${f.bank.verifySeconds.toFixed(1)} s (${f.bank.matchesPerDraw.toFixed(2)} matches per draw, ` +
      `coverage ${(100 * f.bank.coverage).toFixed(1)}%); ${f.bank.speedupOverExhaustive.toFixed(0)}× faster per draw than every template ` +
      `(${f.bank.exhaustiveSecondsPerDraw.toFixed(2)} s per draw)`,
    `8s. aligned-spin templates (fast phase path, 64 templates, spins 0.4/−0.2): ${f.spinningTemplateCost.spinningMsPerTemplate.toFixed(2)} ms against ` +
      `${f.spinningTemplateCost.nonSpinningMsPerTemplate.toFixed(2)} ms without spins = ${f.spinningTemplateCost.ratio.toFixed(2)}× (target ≤ 1.5×)`,
    ...rateLines(f.rates),
  ];
  process.stdout.write(lines.join("\n") + "\n");
}
