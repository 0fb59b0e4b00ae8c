#!/usr/bin/env node
// Regenerates the synthetic demo data in this folder from fixed seeds (run `npm run build` first):
//   node data-synthetic/make.mjs
// Everything here is invented: the detector "site-a" is a made-up site, the noise is seeded
// Gaussian noise coloured by the ajith2011 analytic curve, the two inspirals are simulated.
import { spawnSync } from "node:child_process";
import { fileURLToPath } from "node:url";
import { dirname, join } from "node:path";
import { SITE_A, ajith2011, optimalSnr, writeFileAtomic } from "../packages/core/dist/index.js";

const here = dirname(fileURLToPath(import.meta.url));
const cli = join(here, "..", "packages", "cli", "dist", "main.js");

const SAMPLE_RATE = 2048;
const START_TIME = 1_000_000_000;
const DURATION = 128;
const F_MIN_HZ = 30;
const SEED = 2024;

// Two invented binaries, 39 s apart, placed at the distance that gives each its target optimal SNR
// in site-a on the ajith2011 curve (optimal SNR scales as 1 / distance).
const scenario = [
  {
    targetSnr: 16,
    injection: {
      primaryMassSolar: 1.4,
      secondaryMassSolar: 1.3,
      coalescenceTime: START_TIME + 62.4,
      distanceMpc: 1,
      inclination: 0.6,
      rightAscension: 1.9,
      declination: 0.7,
      polarisation: 0.4,
      phase: 1.1,
    },
  },
  {
    targetSnr: 19,
    injection: {
      primaryMassSolar: 10,
      secondaryMassSolar: 8,
      coalescenceTime: START_TIME + 101.7,
      distanceMpc: 1,
      inclination: 2.2,
      rightAscension: 4.4,
      declination: -0.3,
      polarisation: 2.1,
      phase: 0.3,
    },
  },
];

const injections = scenario.map(({ targetSnr, injection }) => {
  const atOneMpc = optimalSnr(injection, ajith2011, SAMPLE_RATE, F_MIN_HZ, SITE_A);
  return { ...injection, distanceMpc: Number((atOneMpc / targetSnr).toPrecision(6)) };
});

const input = join(here, "site-a-synthetic.input.json");
writeFileAtomic(input, `${JSON.stringify({ synthetic: true, injections }, null, 2)}\n`);

const args = [
  cli, "simulate",
  "--noise-curve", "ajith2011",
  "--duration", String(DURATION),
  "--rate", String(SAMPLE_RATE),
  "--start", String(START_TIME),
  "--fmin", String(F_MIN_HZ),
  "--seed", String(SEED),
  "--detector", "site-a",
  "--inject", input,
  "--label", "synthetic demo: site-a, ajith2011 noise, two simulated inspirals",
  "--out", join(here, "site-a-synthetic.f32"),
];
const r = spawnSync(process.execPath, args, { stdio: "inherit" });
process.exit(r.status ?? 1);
