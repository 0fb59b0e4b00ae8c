// Headless Chromium (Debian's `apt-get install chromium`) for the browser checks of the report and plots.
import { spawnSync } from "node:child_process";
import { writeFileSync } from "node:fs";
import { join } from "node:path";
import { it } from "vitest";

/** The Chromium binary, if present. */
export function findChromium(): string | null {
  for (const name of ["chromium", "chromium-browser"]) {
    const r = spawnSync(name, ["--version"], { encoding: "utf8" });
    if (r.status === 0) return name;
  }
  return null;
}

/** Without chromium: a failing test under CI=true, else a warning (the browser checks are skipped). */
export function requireChromiumUnderCi(chromium: string | null, file: string): void {
  if (chromium) return;
  if (process.env.CI === "true") {
    it("needs chromium under CI", () => {
      throw new Error("chromium is not installed: the CI script must run `apt-get install -y chromium`");
    });
  } else {
    console.warn(`${file}: skipping the browser check: chromium not found (install it with \`apt-get install chromium\`)`);
  }
}

/**
 * Loads `html` (written to DIR/NAME) in headless Chromium and returns the JSON a page script left in
 * `<pre id="check-result">`, Chromium's exit status and its stderr (console messages).
 */
export function checkInChromium(chromium: string, dir: string, name: string, html: string): { status: number | null; stderr: string; result: unknown } {
  const page = join(dir, name);
  writeFileSync(page, html);
  const r = spawnSync(
    chromium,
    [
      "--headless",
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
      `--user-data-dir=${join(dir, `profile-${name}`)}`,
      "--enable-logging=stderr",
      "--v=0",
      "--virtual-time-budget=5000",
      "--dump-dom",
      `file://${page}`,
    ],
    { encoding: "utf8", timeout: 60_000 },
  );
  const m = /<pre id="check-result">([^<]*)<\/pre>/.exec(r.stdout ?? "");
  const result = m ? JSON.parse(m[1].replace(/&quot;/g, '"').replace(/&lt;/g, "<").replace(/&gt;/g, ">").replace(/&amp;/g, "&")) : null;
  return { status: r.status, stderr: r.stderr ?? "", result };
}

/** Console errors Chromium logged for the page (CONSOLE lines on stderr). */
export function consoleErrors(stderr: string): string[] {
  return stderr.split("\n").filter((l) => /CONSOLE/.test(l) && /error/i.test(l));
}

/**
 * Relative luminance of a CSS colour as the browser reports it ("rgb(r, g, b)"), from the sRGB
 * transfer function and the Rec. 709 weights: W3C, Web Content Accessibility Guidelines (WCAG) 2.1
 * (2018), definition of "relative luminance" (its linear-segment threshold 0.03928, or sRGB's 0.04045,
 * select the same 8-bit values).
 */
export function relativeLuminance(css: string): number {
  const m = /^rgba?\((\d+),\s*(\d+),\s*(\d+)/.exec(css);
  if (!m) throw new Error(`not an rgb() colour: ${css}`);
  const lin = (c: string): number => {
    const v = Number(c) / 255;
    return v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4;
  };
  return 0.2126 * lin(m[1]) + 0.7152 * lin(m[2]) + 0.0722 * lin(m[3]);
}

/** WCAG 2.1 contrast ratio (L_lighter + 0.05) / (L_darker + 0.05) of two relative luminances. */
export function contrastRatio(a: number, b: number): number {
  return (Math.max(a, b) + 0.05) / (Math.min(a, b) + 0.05);
}
