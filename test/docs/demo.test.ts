import { describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { join } from "node:path";
import { runCli } from "../cli/helpers.js";

const root = fileURLToPath(new URL("../..", import.meta.url));

describe("npm run demo (the README's first command)", () => {
  it("scans the shipped synthetic data and finds both injected chirps with their chirp masses", () => {
    const script: string = JSON.parse(readFileSync(join(root, "package.json"), "utf8")).scripts.demo;
    const prefix = "node packages/cli/dist/main.js ";
    expect(script.startsWith(prefix)).toBe(true);
    // The same arguments, as JSON lines so the test can read them (its wall time goes to npm run bench).
    const args = script.slice(prefix.length).split(/\s+/).filter((a) => a !== "--format" && a !== "table");
    const r = runCli([...args, "--json", "--quiet"], { cwd: root });
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    const lines = r.stdout.trim().split("\n").map((l) => JSON.parse(l));
    const candidates = lines.filter((l) => l.type === "candidate");
    const manifest = JSON.parse(readFileSync(join(root, "data-synthetic", "site-a-synthetic.f32.injections.json"), "utf8"));
    expect(manifest.synthetic).toBe(true);
    for (const inj of manifest.injections) {
      const mc = (inj.primaryMassSolar * inj.secondaryMassSolar) ** 0.6 / (inj.primaryMassSolar + inj.secondaryMassSolar) ** 0.2;
      const found = candidates.filter((c) => Math.abs(c.coalescenceTime - inj.coalescenceTime) < 0.05);
      expect(found).toHaveLength(1);
      expect(Math.abs(found[0].chirpMassSolar / mc - 1)).toBeLessThan(0.02);
    }
    expect(candidates).toHaveLength(manifest.injections.length);
    // The summary says how much of the 128 s file could hold a coalescence, and why not the rest.
    const summary = lines.find((l) => l.type === "summary");
    expect(summary.dataSeconds).toBe(128);
    expect(summary.analysedSeconds).toBeCloseTo(summary.dataSeconds - summary.leadInSeconds - summary.tailSeconds, 1);
    expect(summary.tailSeconds).toBe(4); // the PSD filter: one Welch segment (common practice, no source)
  });
});
