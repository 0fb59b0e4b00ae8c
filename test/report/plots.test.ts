// The standalone SVG plots (psd --plot, scan --plot, bank --plot, bank sweep --plot) and the
// recover report share one visual language (packages/cli/src/plotStyle.ts) and one exponent
// axis formatter for spectra.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ajith2011, buildBank, colouredNoise, welchPsd, type SweepResult } from "@chirpsieve/core";
import { renderBankPlot, renderSweepPlot } from "../../packages/cli/src/bankPlots.js";
import { FOUND_MARK, INK, MISSED_MARK } from "../../packages/cli/src/plotStyle.js";
import { renderAsdPlot } from "../../packages/cli/src/psdPlot.js";
import { renderCampaignReport } from "../../packages/cli/src/report.js";
import { renderSegmentAsdPlot } from "../../packages/cli/src/scanPlots.js";
import { checkInChromium, consoleErrors, contrastRatio, findChromium, relativeLuminance, requireChromiumUnderCi } from "./chromium.js";
import { smallCampaignDocument } from "./reportFixture.js";

const dir = mkdtempSync(join(tmpdir(), "chirpsieve-plots-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const FS = 2048;
let plots: Record<string, string>;
let reportHtml: string;

beforeAll(async () => {
  // A Welch estimate of seeded ajith2011 noise (what `psd --plot` draws) and the model curve on a
  // segment's frequency grid (what `scan --plot` draws for a segment).
  const noise = colouredNoise(ajith2011, 64 * FS, FS, "plots");
  const estimate = welchPsd(noise, FS, { segmentLength: 4 * FS, average: "median" });
  const n = 4096;
  const frequencies = new Float64Array(n);
  const psd = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    frequencies[i] = 20 + (i * (FS / 2 - 20)) / n;
    psd[i] = ajith2011.evaluate(frequencies[i]);
  }
  const bank = buildBank({ massRangeSolar: [8, 12], matchFloor: 0.95, fMinHz: 30, psd: ajith2011 });
  const sweep: SweepResult = {
    draws: 10,
    signal: "taylorf2",
    rows: [0.9, 0.95, 0.97].map((mm, i) => ({
      matchFloor: mm, templateCount: 10 * (i + 1), volumeEstimate: 10 * (i + 1), coverage: 1, minFittingFactor: mm,
      meanFittingFactor: mm + 0.01, meanCube: (mm + 0.01) ** 3, rateLoss: 1 - (mm + 0.01) ** 3,
    })),
  } as SweepResult;
  plots = {
    "psd": renderAsdPlot(estimate, 30, "noise.f32"),
    "scan-psd": renderSegmentAsdPlot(frequencies, psd),
    "bank": renderBankPlot(bank),
    "sweep": renderSweepPlot(sweep, { massRangeSolar: [8, 12], fMinHz: 30 }),
  };
  reportHtml = renderCampaignReport(await smallCampaignDocument());
});

/** The y-axis tick labels of a Plot SVG (empty labels dropped). */
function yTickLabels(svg: string): string[] {
  const g = /<g[^>]*aria-label="y-axis tick label"[^>]*>([\s\S]*?)<\/g>/.exec(svg);
  if (!g) return [];
  return [...g[1].matchAll(/<text[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]).filter((t) => t !== "");
}

describe("plot style", () => {
  it("labels both spectral plots' axes in exponent notation, never with SI prefixes", () => {
    for (const name of ["psd", "scan-psd"]) {
      const labels = yTickLabels(plots[name]);
      expect(labels.length, name).toBeGreaterThanOrEqual(2);
      for (const l of labels) expect(l, name).toMatch(/^\d(\.\d+)?e-2\d$/);
    }
  });

  it("says '1 segment' in the psd plot of a one-segment estimate", () => {
    const one = welchPsd(colouredNoise(ajith2011, 4 * FS, FS, "one"), FS, { segmentLength: 4 * FS, average: "mean" });
    expect(one.segments).toBe(1);
    expect(renderAsdPlot(one, 30, "short.f32")).toMatch(/mean of 1 segment(?!s)/);
  });

  it("draws every plot and the report only in the palette's inks", () => {
    const allowed = new Set<string>(["currentColor", "none", ...Object.values(INK)]);
    const svgs = [...Object.values(plots), ...(reportHtml.match(/<svg[\s\S]*?<\/svg>/g) ?? [])];
    expect(svgs.length).toBeGreaterThan(6);
    for (const svg of svgs) {
      for (const m of svg.matchAll(/\b(?:fill|stroke)="([^"]*)"/g)) expect(allowed, m[0]).toContain(m[1]);
    }
  });

  it("gives found and missed markers different shapes, fills and lightness", () => {
    expect(FOUND_MARK.symbol).not.toBe(MISSED_MARK.symbol);
    expect(FOUND_MARK.fill).not.toBe("none");
    expect(MISSED_MARK.fill).toBe("none");
    const hex = (h: string) => `rgb(${parseInt(h.slice(1, 3), 16)}, ${parseInt(h.slice(3, 5), 16)}, ${parseInt(h.slice(5, 7), 16)})`;
    // WCAG 2.1 success criterion 1.4.11 (W3C, 2018): 3:1 for graphical objects that carry meaning.
    expect(contrastRatio(relativeLuminance(hex(FOUND_MARK.fill)), relativeLuminance(hex(MISSED_MARK.stroke)))).toBeGreaterThanOrEqual(3);
  });

  it("keeps found and missed apart for the common colour-vision deficiencies", () => {
    // Simulated dichromacy at full severity: Machado, Oliveira & Fernandes, IEEE Trans. Vis. Comput.
    // Graph. 15, 1291 (2009), Table 1 (severity 1.0), applied to linear RGB; coefficients from memory,
    // so the check asks for 4:1 where 3:1 would do, a margin wider than a slip in the third digit.
    const matrices: Record<string, number[][]> = {
      protanopia: [[0.152286, 1.052583, -0.204868], [0.114503, 0.786281, 0.099216], [-0.003882, -0.048116, 1.051998]],
      deuteranopia: [[0.367322, 0.860646, -0.227968], [0.280085, 0.672501, 0.047413], [-0.011820, 0.042940, 0.968881]],
      tritanopia: [[1.255528, -0.076749, -0.178779], [-0.078411, 0.930809, 0.147602], [0.004733, 0.691367, 0.303900]],
    };
    const linear = (h: string) => [1, 3, 5].map((i) => {
      const v = parseInt(h.slice(i, i + 2), 16) / 255;
      return v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4;
    });
    const luminance = (rgb: number[]) => 0.2126 * rgb[0] + 0.7152 * rgb[1] + 0.0722 * rgb[2];
    for (const [name, m] of Object.entries(matrices)) {
      const seen = (h: string) => m.map((row) => Math.min(1, Math.max(0, row[0] * linear(h)[0] + row[1] * linear(h)[1] + row[2] * linear(h)[2])));
      expect(contrastRatio(luminance(seen(FOUND_MARK.fill)), luminance(seen(MISSED_MARK.stroke))), name).toBeGreaterThanOrEqual(4);
    }
  });
});

const chromium = findChromium();
requireChromiumUnderCi(chromium, "plots.test.ts");

// The standalone SVGs, each in a figure, with a script that records sizes, drawn marks and the
// y-axis tick labels the browser lays out.
const CHECK = `<script>
window.__errors = [];
window.addEventListener("error", (e) => window.__errors.push(String(e.message)));
window.addEventListener("load", () => {
  const figs = [...document.querySelectorAll("figure[data-plot]")].map((f) => {
    const svgs = [...f.querySelectorAll("svg")];
    const box = svgs[0].getBoundingClientRect();
    const ticks = [...f.querySelectorAll('g[aria-label="y-axis tick label"] text')].map((t) => t.textContent).filter((t) => t);
    return { name: f.dataset.plot, width: box.width, height: box.height, marks: svgs[0].querySelectorAll("circle,path,rect,line,text").length, ticks };
  });
  const out = document.createElement("pre");
  out.id = "check-result";
  out.textContent = JSON.stringify({ figs, errors: window.__errors });
  document.body.appendChild(out);
});
</script>`;

describe.skipIf(!chromium)("standalone plots in headless Chromium", () => {
  it("renders every plot with a size and marks, and the spectra with exponent tick labels", () => {
    const body = Object.entries(plots).map(([name, svg]) => `<figure data-plot="${name}">${svg}</figure>`).join("\n");
    const r = checkInChromium(chromium!, dir, "plots.html", `<!DOCTYPE html><html><head><meta charset="utf-8"></head><body>${body}\n${CHECK}\n</body></html>`);
    expect(r.status, r.stderr).toBe(0);
    expect(r.result, "the check script did not run").not.toBeNull();
    const result = r.result as { figs: { name: string; width: number; height: number; marks: number; ticks: string[] }[]; errors: string[] };
    expect(result.errors).toEqual([]);
    expect(result.figs.map((f) => f.name)).toEqual(Object.keys(plots));
    for (const f of result.figs) {
      expect(f.width, f.name).toBeGreaterThan(100);
      expect(f.height, f.name).toBeGreaterThan(100);
      expect(f.marks, f.name).toBeGreaterThan(10);
    }
    for (const f of result.figs.filter((x) => x.name === "psd" || x.name === "scan-psd")) {
      expect(f.ticks.length, f.name).toBeGreaterThanOrEqual(2);
      for (const t of f.ticks) expect(t, f.name).toMatch(/^\d(\.\d+)?e-2\d$/);
    }
    expect(consoleErrors(r.stderr)).toEqual([]);
  });
});
