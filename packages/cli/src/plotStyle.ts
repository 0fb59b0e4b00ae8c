// chirpsieve's visual language, defined once for every plot (recover report, scan, psd, bank).
//
// Two inks carry the data: a deep blue for the main series (found injections, spectra, templates)
// and a light amber for the contrasting one (missed injections). They sit at the two ends of the
// lightness scale, so they stay apart in greyscale (relative luminance about 0.05 against 0.47),
// and on the blue–yellow axis, which the common red–green colour-vision deficiencies preserve.
// Found and missed also differ in shape and fill, a filled diamond against an open upward triangle,
// so they can be told apart without colour. Guides (thresholds, equality lines, cutoffs) are a mid
// grey, dashed.
import type * as Plot from "@observablehq/plot";

/** The palette: every colour a chirpsieve plot uses. */
export const INK = {
  /** The main series: found injections, efficiencies, spectra, SNR series, templates, histograms. */
  main: "#1c3f75",
  /** The contrasting series: missed injections. */
  second: "#f0a83c",
  /** Guide lines: thresholds, equality, cutoffs, expectation curves. */
  guide: "#8c8c8c",
} as const;

/** Dash pattern of guide lines. */
export const GUIDE_DASH = "5 3";

/** Marker of a point of the main series: a filled diamond. */
export const POINT_MARK = { symbol: "diamond", fill: INK.main, stroke: "none", r: 3.6 } as const;

/** Marker of a found injection: the main series' filled diamond. */
export const FOUND_MARK = POINT_MARK;

/** Marker of a missed injection: an open upward triangle with a thick amber edge. */
export const MISSED_MARK = { symbol: "triangle", fill: "none", stroke: INK.second, strokeWidth: 1.6, r: 4.2 } as const;

/** Words for the two markers, used in captions. */
export const FOUND_WORDS = "dark blue filled diamonds";
export const MISSED_WORDS = "amber open triangles";

/**
 * Tick labels of a logarithmic axis spanning many decades (strain, spectral densities): exponent
 * notation, "1e-23", and never SI prefixes (which would print 10⁻²⁴ as "1y").
 */
export const EXPONENT_TICKS = "~e";

/** The y axis of an amplitude spectral density plot, shared by `psd --plot` and `scan --plot`. */
export function asdAxis(): Plot.ScaleOptions {
  return { type: "log", label: "amplitude spectral density (1/√Hz)", grid: true, tickFormat: EXPONENT_TICKS };
}
