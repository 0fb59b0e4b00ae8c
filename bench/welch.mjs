// Timing of the Welch PSD estimate (not a test): the median-averaged estimate the search makes per
// segment (2^21 samples at 4096 Hz, 4 s Hann segments, 50% overlap) and a smaller mean-averaged one.
// Build first: `npx tsc -b packages/core`, then `node bench/welch.mjs`. An optional argument names
// another build of the core to time (e.g. a copy of an older dist/ for a side-by-side comparison):
// `node bench/welch.mjs /tmp/old-dist/index.js`.
import { performance } from "node:perf_hooks";
import { pathToFileURL } from "node:url";

const target = process.argv[2] ? pathToFileURL(process.argv[2]).href : "../packages/core/dist/index.js";
const { colouredNoise, ajith2011, flatPsd, loadFftBackends, welchPsd } = await import(target);
await loadFftBackends();

function median(values) {
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/** Median milliseconds of `run()` after a short warm-up, at least 7 runs and about `budgetMs`. */
function time(run, budgetMs = 4000) {
  for (let i = 0; i < 2; i++) run();
  const samples = [];
  const start = performance.now();
  while (samples.length < 7 || (performance.now() - start < budgetMs && samples.length < 200)) {
    const t0 = performance.now();
    run();
    samples.push(performance.now() - t0);
  }
  return median(samples);
}

const fs = 4096;
const search = colouredNoise(ajith2011, 2 ** 21, fs, "bench-welch");
const small = colouredNoise(flatPsd(), 2 ** 16, fs, "bench-welch-small");
const rows = {
  "median, 2^21 samples, 4 s segments (ms)": time(() => welchPsd(search, fs, { segmentLength: 4 * fs, average: "median" })),
  "mean, 2^21 samples, 4 s segments (ms)": time(() => welchPsd(search, fs, { segmentLength: 4 * fs, average: "mean" })),
  "median, 2^16 samples, 1/16 s segments (ms)": time(() => welchPsd(small, fs, { segmentLength: 256, average: "median" })),
};
for (const [k, v] of Object.entries(rows)) console.log(`${k}: ${v.toFixed(2)}`);
