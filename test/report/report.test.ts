import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { REPORT_PLOTS, renderCampaignReport } from "../../packages/cli/src/report.js";
import type { CampaignDocument } from "../../packages/cli/src/reportData.js";
import { checkInChromium, consoleErrors, contrastRatio, findChromium, relativeLuminance, requireChromiumUnderCi } from "./chromium.js";
import { smallCampaignDocument } from "./reportFixture.js";

const dir = mkdtempSync(join(tmpdir(), "chirpsieve-report-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

let doc: CampaignDocument;
let html: string;
beforeAll(async () => {
  doc = await smallCampaignDocument();
  html = renderCampaignReport(doc);
});

describe("campaign HTML report (static checks)", () => {
  it("is one self-contained page: no scripts, no external resources", () => {
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toMatch(/<(img|link|iframe|object|embed)\b/i);
    expect(html).not.toMatch(/@import|url\(/i);
    // The only URL allowed is the SVG namespace, which is never fetched.
    const urls = html.match(/https?:\/\/[^\s"'<>)]+/g) ?? [];
    expect(urls.filter((u) => u !== "http://www.w3.org/2000/svg" && u !== "http://www.w3.org/1999/xlink")).toEqual([]);
  });

  it("has every plot as inline SVG, the worst-miss table and plain warnings", () => {
    for (const name of REPORT_PLOTS) expect(html).toMatch(new RegExp(`<figure class="plot" data-plot="${name}"><svg`));
    expect(html).toContain("not detections of real sources");
    expect(html).toContain("synthetic");
    expect(doc.summary.missed).toBeGreaterThan(0);
    expect(html).toMatch(/<table id="worst-misses">/);
    expect(html).toMatch(/NOT MET/); // the time-error<=0 rule of the fixture
  });
});

const chromium = findChromium();
requireChromiumUnderCi(chromium, "report.test.ts");

// Appended to a copy of the report (the report itself has no script): after load, records each
// plot's size and number of drawn elements, and any page error, into the DOM for --dump-dom.
const CHECK = `<script>
window.__errors = [];
window.addEventListener("error", (e) => window.__errors.push(String(e.message)));
window.addEventListener("load", () => {
  const figs = [...document.querySelectorAll("figure[data-plot]")].map((f) => {
    const svg = f.querySelector("svg");
    const box = svg ? svg.getBoundingClientRect() : { width: 0, height: 0 };
    return { name: f.dataset.plot, width: box.width, height: box.height, marks: svg ? svg.querySelectorAll("circle,path,rect,line,text").length : 0 };
  });
  // The markers of the found-missed plot as the browser paints them.
  const fm = document.querySelector('figure[data-plot="found-missed"] svg');
  const marker = (label) => {
    const g = fm && fm.querySelector('g[aria-description="' + label + '"]');
    const p = g && g.querySelector("path");
    if (!p) return null;
    const cs = getComputedStyle(p);
    return { fill: cs.fill, stroke: cs.stroke, strokeWidth: parseFloat(cs.strokeWidth), d: p.getAttribute("d"), count: g.querySelectorAll("path").length };
  };
  const out = document.createElement("pre");
  out.id = "check-result";
  out.textContent = JSON.stringify({ figs, errors: window.__errors, found: marker("found"), missed: marker("missed") });
  document.body.appendChild(out);
});
</script>`;

describe.skipIf(!chromium)("campaign HTML report in headless Chromium", () => {
  let r: ReturnType<typeof checkInChromium>;
  beforeAll(() => {
    r = checkInChromium(chromium!, dir, "report-check.html", html.replace("</body>", `${CHECK}\n</body>`));
  });

  it("renders every plot with a size and drawn marks, and logs no error", () => {
    expect(r.status, r.stderr).toBe(0);
    expect(r.result, "the check script did not run").not.toBeNull();
    const result = r.result as {
      figs: { name: string; width: number; height: number; marks: number }[];
      errors: string[];
    };
    expect(result.errors).toEqual([]);
    expect(result.figs.map((f) => f.name)).toEqual([...REPORT_PLOTS]);
    for (const f of result.figs) {
      expect(f.width, f.name).toBeGreaterThan(100);
      expect(f.height, f.name).toBeGreaterThan(100);
      expect(f.marks, f.name).toBeGreaterThan(10);
    }
    // Console errors from the page (Chromium logs them as CONSOLE lines on stderr).
    expect(consoleErrors(r.stderr)).toEqual([]);
  });

  it("paints found and missed injections so that they differ in greyscale and in shape", () => {
    expect(r.status, r.stderr).toBe(0);
    type Marker = { fill: string; stroke: string; strokeWidth: number; d: string; count: number } | null;
    const { found, missed } = r.result as { found: Marker; missed: Marker };
    expect(found, "no found marker drawn").not.toBeNull();
    expect(missed, "no missed marker drawn").not.toBeNull();
    expect(found!.count).toBe(doc.summary.found);
    expect(missed!.count).toBe(doc.summary.missed);
    // Found: a filled shape; missed: an outline only, of another shape.
    expect(found!.fill).toMatch(/^rgb/);
    expect(missed!.fill).toBe("none");
    expect(missed!.stroke).toMatch(/^rgb/);
    expect(missed!.strokeWidth).toBeGreaterThanOrEqual(1.5);
    expect(missed!.d).not.toBe(found!.d);
    // In greyscale only the luminance of the painted colour is left. WCAG 2.1 success criterion
    // 1.4.11 (W3C, 2018) asks graphical objects that carry meaning for a 3:1 contrast ratio; the two
    // markers must reach it against each other.
    const lFound = relativeLuminance(found!.fill);
    const lMissed = relativeLuminance(missed!.stroke);
    expect(contrastRatio(lFound, lMissed)).toBeGreaterThanOrEqual(3);
  });
});
