// SVG plot of an estimated amplitude spectral density (loaded only when a plot is asked for).
import * as Plot from "@observablehq/plot";
import type { WelchPsd } from "@chirpsieve/core";
import { renderSvg } from "./plot.js";
import { GUIDE_DASH, INK, asdAxis } from "./plotStyle.js";

/** SVG log–log plot of the amplitude spectral density √S(f), with the horizon's fmin marked. */
export function renderAsdPlot(estimate: WelchPsd, fMinHz: number, file: string): string {
  const n = estimate.psd.length;
  const stride = Math.max(1, Math.floor(n / 4000));
  const points: { f: number; asd: number }[] = [];
  for (let k = 1; k < n; k += stride) {
    const s = estimate.psd[k];
    if (s > 0 && Number.isFinite(s)) points.push({ f: estimate.frequencies[k], asd: Math.sqrt(s) });
  }
  const label = file.replace(/^.*[\\/]/, "");
  return renderSvg({
    width: 720,
    height: 400,
    marginLeft: 70,
    marginBottom: 45,
    x: { type: "log", label: `frequency (Hz) — ${label}, Welch ${estimate.average} of ${estimate.segments} segment${estimate.segments === 1 ? "" : "s"}` },
    y: asdAxis(),
    marks: [
      Plot.ruleX([fMinHz], { stroke: INK.guide, strokeDasharray: GUIDE_DASH }),
      Plot.line(points, { x: "f", y: "asd", stroke: INK.main }),
    ],
  });
}
