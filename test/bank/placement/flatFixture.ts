// A small placement fixture: a real mass region (8–12 M_sun from 40 Hz) with a constant metric and an
// identity chart, so every stage can be checked against plain Euclidean geometry in milliseconds.
import { createMassRegion } from "../../../packages/core/src/bank/massRegion.js";
import { type Metric2 } from "../../../packages/core/src/bank/metric.js";
import { type PhaseChart } from "../../../packages/core/src/bank/phaseChart.js";
import type { MetricSampler } from "../../../packages/core/src/bank/metricSampler.js";
import type { LatticePatch, PatchBox } from "../../../packages/core/src/bank/patch.js";

export const region = createMassRegion({ minMassSolar: 8, maxMassSolar: 12 }, 40);

/** Minimal match of the fixture, and its covering radius sqrt(1 − MM). */
export const MM = 0.97;
export const r = Math.sqrt(1 - MM);

/**
 * The constant metric: the region (τ0 0.69–1.36 s) is ≈ 22 lattice spacings long and its band
 * (η from η_low ≈ 0.243 to 1/4, Δτ3 ≈ 4 ms) a few covering radii wide.
 */
export const G: Metric2 = { g00: 100, g01: 0, g11: 150 * 150 };

/** Chart coordinates = chirp times. */
export const identityChart: PhaseChart = {
  toX: (t0, t3) => [t0, t3],
  jacobian: () => [
    [1, 0],
    [0, 1],
  ],
  toTau: (x0, x1) => [x0, x1],
  pullBack: (g) => g,
};

/** Distance between two points of the (τ0, τ3) plane under G. */
export function distance(p: [number, number], q: [number, number], g: Metric2 = G): number {
  const d0 = q[0] - p[0];
  const d1 = q[1] - p[1];
  return Math.sqrt(g.g00 * d0 * d0 + 2 * g.g01 * d0 * d1 + g.g11 * d1 * d1);
}

/** A sampler returning G everywhere (density of G in (τ0, η): sqrt(det G) |∂τ3/∂η|). */
export const constantSampler: MetricSampler = (tau0, eta) => ({
  g: G,
  density: Math.sqrt(G.g00 * G.g11 - G.g01 * G.g01) * ((0.6 * region.tau3At(tau0, eta)) / eta),
});

/** A patch over the box with the constant metric sampled on the usual 9 × 5 grid. */
export function constantPatch(box: PatchBox = wholeBox()): LatticePatch {
  const sampleTau0 = Array.from({ length: 9 }, (_, i) => box.tau0Lo + ((box.tau0Hi - box.tau0Lo) * i) / 8);
  return { ...box, metric: G, sampleTau0, samples: sampleTau0.map(() => Array.from({ length: 5 }, () => G)) };
}

export function wholeBox(): PatchBox {
  return { tau0Lo: region.tau0Min, tau0Hi: region.tau0Max, etaLo: 0, etaHi: 0.25 };
}

/**
 * Points of the region on a grid in (τ0, η): `n` τ0 columns (ends included) × `m` η values from
 * η_low(τ0) to 1/4 (ends included), restricted to τ0 ∈ [lo, hi].
 */
export function regionGrid(n: number, m: number, lo = region.tau0Min, hi = region.tau0Max): [number, number][] {
  const out: [number, number][] = [];
  for (let i = 0; i < n; i++) {
    const t0 = lo + ((hi - lo) * i) / (n - 1);
    const eLo = Math.max(0, region.etaLow(t0));
    if (!(eLo <= 0.25)) continue;
    for (let j = 0; j < m; j++) {
      const eta = eLo + ((0.25 - eLo) * j) / (m - 1);
      out.push([t0, region.tau3At(t0, eta)]);
    }
  }
  return out;
}

/** The largest distance (under G) from a grid point to its nearest template, in covering radii. */
export function worstCover(points: readonly { tau0: number; tau3: number }[], grid: [number, number][]): number {
  let worst = 0;
  for (const p of grid) {
    let best = Infinity;
    for (const q of points) best = Math.min(best, distance(p, [q.tau0, q.tau3]));
    worst = Math.max(worst, best / r);
  }
  return worst;
}
