// How much one 2 × 2 metric differs from another: the range of their ratio over directions.
import { metricFactor, type Metric2 } from "./metric.js";

/** Generalised eigenvalues (min, max) of the pencil (a, b): the range of (xᵀ a x)/(xᵀ b x). */
export function metricRatioRange(a: Metric2, b: Metric2): [number, number] {
  // Whiten by b = Wᵀ W (W upper triangular), then the eigenvalues of W⁻ᵀ a W⁻¹.
  const { w00, w01, w11 } = metricFactor(b);
  // W⁻¹ = [[1/w00, −w01/(w00 w11)], [0, 1/w11]]
  const i00 = 1 / w00;
  const i01 = -w01 / (w00 * w11);
  const i11 = 1 / w11;
  const m00 = a.g00 * i00 * i00;
  const m01 = i00 * (a.g00 * i01 + a.g01 * i11);
  const m11 = a.g00 * i01 * i01 + 2 * a.g01 * i01 * i11 + a.g11 * i11 * i11;
  const tr = 0.5 * (m00 + m11);
  const disc = Math.sqrt(Math.max(0, 0.25 * (m00 - m11) * (m00 - m11) + m01 * m01));
  return [tr - disc, tr + disc];
}
