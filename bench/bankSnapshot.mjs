// Bank placement guard (not a test): builds banks for a fixed list of regions and saves, compares or
// times them. It imports the BUILT core, so build first (`npm run build`).
//
//   node bench/bankSnapshot.mjs save DIR [--only a,b]         write DIR/<region>.json (templates + report)
//   node bench/bankSnapshot.mjs compare DIR [--only a,b]      rebuild and compare bit for bit with DIR
//   node bench/bankSnapshot.mjs time OTHER_CORE [--only a,b] [--repeat N]
//        time placement by the built core and by OTHER_CORE (the index.js of another build, e.g. a
//        copy of packages/core/dist made before a change) alternately in this one process; prints the
//        median of N (default 3) per region and the ratio (other / this).
//
// A refactoring of the placement must keep every template list identical: save before, compare after
// each step. Template numbers are written with JSON's shortest round-tripping form, so equal text is
// equal doubles.
import { mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { performance } from "node:perf_hooks";
import { pathToFileURL } from "node:url";

/** The regions of the bank tests, the README and the CLI tests (ajith2011 throughout). */
const REGIONS = {
  "1-3@30": { massRangeSolar: [1, 3], matchFloor: 0.97, fMinHz: 30 },
  "1-3@30-lattice": { massRangeSolar: [1, 3], matchFloor: 0.97, fMinHz: 30, bandRows: false },
  "1.2-2@40": { massRangeSolar: [1.2, 2], matchFloor: 0.97, fMinHz: 40 },
  "5-30@20": { massRangeSolar: [5, 30], matchFloor: 0.97, fMinHz: 20 },
  "5-30@20-capped": { massRangeSolar: [5, 30], matchFloor: 0.97, fMinHz: 20, massRatioCap: 4, totalMassCapSolar: 40 },
  "3-10@20": { massRangeSolar: [3, 10], matchFloor: 0.97, fMinHz: 20 },
  "3-10@20-lattice": { massRangeSolar: [3, 10], matchFloor: 0.97, fMinHz: 20, bandRows: false },
  "3-10@20-mm0.985": { massRangeSolar: [3, 10], matchFloor: 0.985, fMinHz: 20 },
  "8-12@40": { massRangeSolar: [8, 12], matchFloor: 0.97, fMinHz: 40 },
  "8-12@30-mm0.95": { massRangeSolar: [8, 12], matchFloor: 0.95, fMinHz: 30 },
  "8-20@20": { massRangeSolar: [8, 20], matchFloor: 0.97, fMinHz: 20 },
  "8-20@20-q2-mm0.95": { massRangeSolar: [8, 20], matchFloor: 0.95, fMinHz: 20, massRatioCap: 2 },
  "10-20@25-mm0.95": { massRangeSolar: [10, 20], matchFloor: 0.95, fMinHz: 25 },
  "1-3@40-fmax52": { massRangeSolar: [1, 3], matchFloor: 0.97, fMinHz: 40, fMaxHz: 52 },
  "1-2@30-mm0.9": { massRangeSolar: [1, 2], matchFloor: 0.9, fMinHz: 30 },
  "20-40@30-mm0.9": { massRangeSolar: [20, 40], matchFloor: 0.9, fMinHz: 30 },
  "5-15@30": { massRangeSolar: [5, 15], matchFloor: 0.97, fMinHz: 30 },
  "1.2-12@40": { massRangeSolar: [1.2, 12], matchFloor: 0.97, fMinHz: 40 },
  "1.2-12@40-lattice": { massRangeSolar: [1.2, 12], matchFloor: 0.97, fMinHz: 40, bandRows: false },
  "1-3@30-tol0.2": { massRangeSolar: [1, 3], matchFloor: 0.97, fMinHz: 30, tolerance: 0.2 },
  "1-10@10": { massRangeSolar: [1, 10], matchFloor: 0.97, fMinHz: 10 },
};

const [mode, target, ...rest] = process.argv.slice(2);
const flag = (name) => {
  const i = rest.indexOf(name);
  return i >= 0 ? rest[i + 1] : undefined;
};
const only = flag("--only")?.split(",");
const names = Object.keys(REGIONS).filter((n) => !only || only.includes(n));
const here = await import(pathToFileURL(resolve("packages/core/dist/index.js")).href);

function build(core, name) {
  const t0 = performance.now();
  const { bank, report } = core.buildBankWithReport({ ...REGIONS[name], psd: core.ajith2011 });
  return { bank, report, ms: performance.now() - t0 };
}
const snapshot = ({ bank, report }) => JSON.stringify({ report, templates: bank.templates }, null, 0).replaceAll("},{", "},\n{");

if (mode === "save" && target) {
  mkdirSync(target, { recursive: true });
  for (const name of names) {
    const b = build(here, name);
    writeFileSync(join(target, `${name}.json`), snapshot(b) + "\n");
    console.log(`${name}: ${b.bank.templates.length} templates, ${(b.ms / 1000).toFixed(1)} s`);
  }
} else if (mode === "compare" && target) {
  let bad = 0;
  for (const name of names) {
    const b = build(here, name);
    const want = readFileSync(join(target, `${name}.json`), "utf8");
    const same = snapshot(b) + "\n" === want;
    if (!same) bad++;
    console.log(`${name}: ${same ? "identical" : "DIFFERENT"} (${b.bank.templates.length} templates, ${(b.ms / 1000).toFixed(1)} s)`);
  }
  process.exitCode = bad > 0 ? 1 : 0;
} else if (mode === "time" && target) {
  const other = await import(pathToFileURL(resolve(target)).href);
  const repeat = Number(flag("--repeat") ?? 3);
  const median = (xs) => [...xs].sort((p, q) => p - q)[Math.floor(xs.length / 2)];
  for (const name of names) {
    const mine = [];
    const theirs = [];
    for (let k = 0; k < repeat; k++) {
      theirs.push(build(other, name).ms);
      mine.push(build(here, name).ms);
    }
    const a = median(mine);
    const b = median(theirs);
    console.log(`${name}: this ${(a / 1000).toFixed(2)} s, other ${(b / 1000).toFixed(2)} s, other/this ${(b / a).toFixed(3)}`);
  }
} else {
  console.error("usage: node bench/bankSnapshot.mjs save DIR | compare DIR | time OTHER_CORE_INDEX [--only a,b] [--repeat N]");
  process.exitCode = 2;
}
