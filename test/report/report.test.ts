import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { REPORT_PLOTS, renderCampaignReport } from "../../packages/cli/src/report.js";
import type { CampaignDocument } from "../../packages/cli/src/reportData.js";
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

/** Chromium from Debian (`apt-get install chromium`), if present. */
function findChromium(): string | null {
  for (const name of ["chromium", "chromium-browser"]) {
    const r = spawnSync(name, ["--version"], { encoding: "utf8" });
    if (r.status === 0) return name;
  }
  return null;
}

const chromium = findChromium();
if (!chromium) {
  if (process.env.CI === "true") {
    it("needs chromium under CI", () => {
      throw new Error("chromium is not installed: the CI script must run `apt-get install -y chromium`");
    });
  } else {
    console.warn("report.test.ts: skipping the browser check: chromium not found (install it with `apt-get install chromium`)");
  }
}

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
  const out = document.createElement("pre");
  out.id = "check-result";
  out.textContent = JSON.stringify({ figs, errors: window.__errors });
  document.body.appendChild(out);
});
</script>`;

describe.skipIf(!chromium)("campaign HTML report in headless Chromium", () => {
  it("renders every plot with a size and drawn marks, and logs no error", () => {
    const page = join(dir, "report-check.html");
    writeFileSync(page, html.replace("</body>", `${CHECK}\n</body>`));
    const r = spawnSync(
      chromium!,
      [
        "--headless",
        "--no-sandbox",
        "--disable-gpu",
        "--disable-quic",
        "--no-first-run",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
        `--user-data-dir=${join(dir, "profile")}`,
        "--enable-logging=stderr",
        "--v=0",
        "--virtual-time-budget=5000",
        "--dump-dom",
        `file://${page}`,
      ],
      { encoding: "utf8", timeout: 60_000 },
    );
    expect(r.status, r.stderr).toBe(0);
    const m = /<pre id="check-result">([^<]*)<\/pre>/.exec(r.stdout);
    expect(m, "the check script did not run").not.toBeNull();
    const result = JSON.parse(m![1].replace(/&quot;/g, '"').replace(/&amp;/g, "&")) as {
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
    const consoleErrors = r.stderr.split("\n").filter((l) => /CONSOLE/.test(l) && /error/i.test(l));
    expect(consoleErrors).toEqual([]);
  });
});
