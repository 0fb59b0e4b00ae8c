// The placement metric at a point of the (τ0, η) plane, in chart coordinates, remembered once computed.
import type { MassRegion } from "./massRegion.js";
import type { ChirpTimeMetric, Metric2 } from "./metric.js";
import type { PhaseChart } from "./phaseChart.js";
import { placementMetric } from "./placementMetric.js";

/** The placement metric at one (τ0, η), and the proper-area density there. */
export interface MetricSample {
  /** Placement metric (placementMetric.ts) pulled back into chart coordinates (phaseChart.ts). */
  g: Metric2;
  /** sqrt(det g) of the placement metric in (τ0, τ3) times |∂τ3/∂η| = 0.6 τ3 / η: proper area per dτ0 dη. */
  density: number;
}

/** The sample at (τ0, η). Callers may ask for the same point many times; a sampler answers from its cache. */
export type MetricSampler = (tau0: number, eta: number) => MetricSample;

export interface MetricSamplerOptions {
  region: MassRegion;
  metric: ChirpTimeMetric;
  chart: PhaseChart;
  minimalMatch: number;
}

/**
 * A sampler of the placement metric with its cache, keyed by exact (τ0, η): a split patch's halves
 * share about half their sample points with it, so each point is computed once per bank. The density
 * uses τ3 ∝ τ0^{2/5} η^{−3/5} at fixed τ0, so ∂τ3/∂η = −0.6 τ3/η (Sathyaprakash, Phys. Rev. D 50,
 * R7111 (1994), chirp times).
 */
export function createMetricSampler(options: MetricSamplerOptions): MetricSampler {
  const { region, metric, chart, minimalMatch } = options;
  const cache = new Map<number, Map<number, MetricSample>>();
  return (tau0, eta) => {
    let column = cache.get(tau0);
    const known = column?.get(eta);
    if (known) return known;
    const tau3 = region.tau3At(tau0, eta);
    const gTau = placementMetric(metric.tangent(tau0, tau3), tau0, tau3, minimalMatch);
    const density = Math.sqrt(Math.max(0, gTau.g00 * gTau.g11 - gTau.g01 * gTau.g01)) * ((0.6 * tau3) / eta);
    const sample = { g: chart.pullBack(gTau, tau0, tau3), density };
    if (!column) cache.set(tau0, (column = new Map()));
    column.set(eta, sample);
    return sample;
  };
}
