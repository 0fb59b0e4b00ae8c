// What the placement stages pass between them: patches of the (τ0, η) plane and placed points.
import type { Metric2 } from "./metric.js";

/** One placed template position (a lattice point or a row template). */
export interface LatticePoint {
  tau0: number;
  tau3: number;
  /** Index of the patch whose lattice (or whose run of rows) it belongs to. */
  patch: number;
  /** True when the lattice point fell outside the region and was moved onto its boundary. */
  projected: boolean;
}

/** A cell {τ0 ∈ [tau0Lo, tau0Hi], η ∈ [etaLo, etaHi]} of the (τ0, η) plane. */
export interface PatchBox {
  tau0Lo: number;
  tau0Hi: number;
  etaLo: number;
  etaHi: number;
}

/** A cell of the (τ0, η) plane with the one metric its lattice was laid with. */
export interface LatticePatch extends PatchBox {
  /** The conservative placement metric of the patch (placementMetric.ts), in chart coordinates. */
  metric: Metric2;
  /**
   * The placement metrics (chart coordinates) sampled over the patch: samples[i][j] at τ0 =
   * sampleTau0[i] and η at the fraction j/(columns − 1) of [max(etaLo, η_low(τ0)), etaHi]; a row is
   * null where the patch does not meet the region at that τ0.
   */
  sampleTau0: number[];
  samples: (Metric2[] | null)[];
}
