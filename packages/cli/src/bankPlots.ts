// SVG plots of banks and of minimal-match sweeps (loaded only when a plot is asked for).
import * as Plot from "@observablehq/plot";
import type { SweepResult, TemplateBank } from "@chirpsieve/core";
import { renderSvg } from "./plot.js";
import { INK, POINT_MARK } from "./plotStyle.js";

/** Two scatter plots side by side in one standalone SVG: (τ0, τ3) and (m1, m2). */
export function renderBankPlot(bank: TemplateBank): string {
  const width = 520;
  const height = 440;
  const pts = bank.templates.map((t) => ({ tau0: t.tau0, tau3: t.tau3, m1: t.primaryMassSolar, m2: t.secondaryMassSolar }));
  const r = pts.length > 5000 ? 0.6 : pts.length > 1000 ? 1 : 1.8;
  const left = renderSvg({
    width,
    height,
    marginLeft: 60,
    marginBottom: 45,
    x: { label: `τ0 (s) from ${bank.fMinHz} Hz`, grid: true },
    y: { label: "τ3 (s)", grid: true },
    marks: [Plot.dot(pts, { x: "tau0", y: "tau3", r, fill: INK.main, stroke: "none" })],
  });
  const right = renderSvg({
    width,
    height,
    marginLeft: 60,
    marginBottom: 45,
    x: { label: "primary mass (M_sun)", grid: true },
    y: { label: "secondary mass (M_sun)", grid: true },
    marks: [Plot.dot(pts, { x: "m1", y: "m2", r, fill: INK.main, stroke: "none" })],
  });
  const title = `${bank.templates.length} templates, ${bank.massRangeSolar[0]}–${bank.massRangeSolar[1]} M_sun, minimal match ${bank.matchFloor}, ${bank.noiseCurve} from ${bank.fMinHz} Hz`;
  const inner = (svg: string, x: number): string => svg.replace("<svg", `<svg x="${x}" y="24"`);
  return (
    `<svg xmlns="http://www.w3.org/2000/svg" width="${2 * width}" height="${height + 24}" viewBox="0 0 ${2 * width} ${height + 24}">` +
    `<text x="12" y="17" font-family="sans-serif" font-size="13">${escapeXml(title)}</text>` +
    inner(left, 0) +
    inner(right, width) +
    `</svg>\n`
  );
}

/** Trade-off plot: estimated CPU hours per hour of data (or template count) against the rate loss. */
export function renderSweepPlot(result: SweepResult, region: { massRangeSolar: [number, number]; fMinHz: number }): string {
  const hasCost = result.rows.every((r) => r.cpuSecondsPerHour !== undefined);
  const pts = result.rows.map((r) => ({
    loss: 100 * r.rateLoss,
    y: hasCost ? r.cpuSecondsPerHour! / 3600 : r.templateCount,
    label: `MM ${r.matchFloor}`,
  }));
  return renderSvg({
    width: 720,
    height: 420,
    marginLeft: 70,
    marginRight: 80,
    marginBottom: 45,
    inset: 12,
    x: { label: `expected loss of detection rate 1 − ⟨FF³⟩ (%), ${region.massRangeSolar[0]}–${region.massRangeSolar[1]} M_sun from ${region.fMinHz} Hz`, grid: true },
    y: { type: "log", label: hasCost ? "estimated CPU hours per hour of data (measured here, scaled)" : "templates", grid: true, tickFormat: "~g" },
    marks: [
      Plot.line(pts, { x: "loss", y: "y", stroke: INK.main }),
      Plot.dot(pts, { x: "loss", y: "y", ...POINT_MARK }),
      Plot.text(pts, { x: "loss", y: "y", text: "label", dx: 8, textAnchor: "start", fontSize: 10 }),
    ],
  });
}

function escapeXml(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;");
}
