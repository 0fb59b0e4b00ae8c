// Timing of one complex FFT (forward, ordered) per backend: median over repeated runs.
// Not a test. Build first: `npx tsc -b packages/core`, then `node bench/fft.mjs`.
// Both the buffer-owning plan (no copies) and the copy API (float64 in/out) are timed.
import { performance } from "node:perf_hooks";
import seedrandom from "seedrandom";
import { createComplexFft, createComplexPlan, loadFftBackends } from "../packages/core/dist/index.js";

await loadFftBackends();

function median(values) {
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/** Median milliseconds of `run()` after a short warm-up, sampling for about `budgetMs`. */
function time(run, budgetMs = 1500) {
  for (let i = 0; i < 3; i++) run();
  const samples = [];
  const start = performance.now();
  while (samples.length < 7 || (performance.now() - start < budgetMs && samples.length < 400)) {
    const t0 = performance.now();
    run();
    samples.push(performance.now() - t0);
  }
  return median(samples);
}

const rng = seedrandom("bench-fft");
const rows = [];
for (const p of [16, 18, 20]) {
  const n = 2 ** p;
  const x = new Float64Array(2 * n).map(() => rng() - 0.5);
  const row = { size: `2^${p}` };
  for (const backend of ["fftjs", "pffft"]) {
    const plan = createComplexPlan(n, backend);
    plan.input.set(x);
    row[`${backend} plan ms`] = time(() => plan.forward());
    plan.dispose();
    const fft = createComplexFft(n, backend);
    const out = new Float64Array(2 * n);
    row[`${backend} copy ms`] = time(() => fft.forward(x, out));
  }
  row["plan ratio fftjs/pffft"] = row["fftjs plan ms"] / row["pffft plan ms"];
  row["copy ratio fftjs/pffft"] = row["fftjs copy ms"] / row["pffft copy ms"];
  rows.push(row);
}

const fmt = (v) => (typeof v === "number" ? v.toFixed(v < 10 ? 3 : 1) : v);
console.log(`complex forward FFT, median per transform (node ${process.version}, one thread)`);
console.table(rows.map((r) => Object.fromEntries(Object.entries(r).map(([k, v]) => [k, fmt(v)]))));
