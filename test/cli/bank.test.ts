import { fileURLToPath } from "node:url";
import { beforeAll, describe, expect, it } from "vitest";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { spawn } from "node:child_process";
import { CLI, runCli, type CliResult } from "./helpers.js";

/** Runs several CLI invocations concurrently (each is a separate process; startup dominates). */
function runCliAll(argsList: string[][]): Promise<CliResult[]> {
  return Promise.all(
    argsList.map(
      (args) =>
        new Promise<CliResult>((resolvePromise) => {
          const child = spawn(process.execPath, [CLI, ...args], { stdio: ["ignore", "pipe", "pipe"] });
          let stdout = "";
          let stderr = "";
          child.stdout.on("data", (d) => (stdout += d));
          child.stderr.on("data", (d) => (stderr += d));
          child.on("close", (code) => resolvePromise({ code: code ?? -1, stdout, stderr }));
        }),
    ),
  );
}

// Small banks (8–20 M_sun from 20 Hz: ~100 templates) keep these runs fast.
const dir = mkdtempSync(join(tmpdir(), "chirpsieve-cli-bank-"));
const bankPath = join(dir, "bank.json");
const region = ["--mass-range", "8:20", "--fmin", "20", "--noise-curve", "ajith2011"];
const demoStrain = fileURLToPath(new URL("../../data-synthetic/site-a-synthetic.f32", import.meta.url));

function expectOneLineError(r: { code: number; stderr: string }, pattern: RegExp): void {
  expect(r.code).toBe(2);
  const lines = r.stderr.trim().split("\n");
  expect(lines).toHaveLength(1);
  expect(lines[0]).toMatch(pattern);
  expect(r.stderr).not.toMatch(/\bat .*\.js:\d+/);
}

describe("chirpsieve bank", () => {
  let built = { code: -1, stdout: "", stderr: "" };
  beforeAll(() => {
    built = runCli(["bank", ...region, "--match-floor", "0.95", "--out", bankPath, "--plot", join(dir, "bank.svg")]);
  });

  it("builds a bank (the default subcommand), prints a one-line summary and writes JSON and SVG", () => {
    // 8–20 M_sun from 20 Hz reaches binaries whose inspiral to the ISCO carries < 90% of their SNR: one warning.
    expect(built.stderr).toMatch(/^chirpsieve: warning: \d+ of \d+ templates \(total mass [\d.]+–40\.0 M_sun\) carry less than 90% of their signal's SNR in the inspiral to the ISCO .*lighter chirp masses and earlier times/);
    expect(built.stderr.trim().split("\n")).toHaveLength(1);
    expect(built.code).toBe(0);
    expect(built.stdout).toMatch(/^\S+bank\.json: \d+ templates .* metric-volume estimate \d+/);
    const bank = JSON.parse(readFileSync(bankPath, "utf8"));
    expect(bank.fMinHz).toBe(20);
    expect(bank.matchFloor).toBe(0.95);
    expect(bank.massRangeSolar).toEqual([8, 20]);
    expect(bank.generator.tool).toBe("chirpsieve");
    expect(bank.generator.arguments).toContain("--mass-range");
    expect(bank.templates.length).toBeGreaterThan(20);
    const svg = readFileSync(join(dir, "bank.svg"), "utf8");
    expect(svg.startsWith('<svg xmlns="http://www.w3.org/2000/svg"')).toBe(true);
    expect(svg.match(/<svg/g)?.length).toBe(3); // two plots side by side in one file
    expect(svg).toContain("τ0");
    expect(svg).toContain("primary mass");
  });

  it("`bank build` is the same command, and --json reports the placement", () => {
    const out = join(dir, "bank2.json");
    const r = runCli(["bank", "build", ...region, "--match-floor", "0.95", "--out", out, "--json"]);
    expect(r.code).toBe(0);
    const report = JSON.parse(r.stdout);
    expect(report.templateCount).toBe(JSON.parse(readFileSync(bankPath, "utf8")).templates.length);
    expect(report.volumeEstimate).toBeGreaterThan(0);
  });

  it("verifies coverage; --require passes (exit 0) when met and fails (exit 1, naming the shortfall) when not", () => {
    const ok = runCli(["bank", "verify", bankPath, "--draws", "100", "--seed", "7", "--require", "0.9"]);
    expect(ok.code).toBe(0);
    expect(ok.stdout).toMatch(/fitting factor ≥ 0\.95 for 100\.0% of draws/);
    expect(ok.stdout).toMatch(/mean FF³/);
    // A thinned bank (every third template) cannot meet its minimal match everywhere.
    const bank = JSON.parse(readFileSync(bankPath, "utf8"));
    bank.templates = bank.templates.filter((_: unknown, i: number) => i % 3 === 0);
    const thin = join(dir, "thin.json");
    writeFileSync(thin, JSON.stringify(bank));
    const bad = runCli(["bank", "verify", thin, "--draws", "100", "--seed", "7", "--require", "0.99", "--json"]);
    expect(bad.code).toBe(1);
    const report = JSON.parse(bad.stdout);
    expect(report.fractionAboveMinimalMatch).toBeLessThan(0.99);
    expect(bad.stderr).toMatch(/coverage below --require: .* required 99\.0% \(short by \d+\.\d percentage points\)/);
  });

  it("sweeps match floors and labels the scan cost as a measured estimate", () => {
    const r = runCli(["bank", "sweep", ...region, "--match-floor", "0.90:0.95:0.05", "--draws", "40", "--plot", join(dir, "sweep.svg")]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/match floor +templates/);
    expect(r.stdout).toMatch(/0\.900 .*\n.*0\.950/);
    expect(r.stdout).toMatch(/scan cost is an estimate: the search.s own kernel timed on this machine/);
    expect(readFileSync(join(dir, "sweep.svg"), "utf8")).toMatch(/^<svg xmlns="http:\/\/www\.w3\.org\/2000\/svg"/);
  });

  it("rejects bad input with one line naming the flag or file, exit 2", async () => {
    const out = join(dir, "x.json");
    const broken = join(dir, "broken.json");
    writeFileSync(broken, '{"fmin": 20, "matchFloor": 0.95, "noiseCurve": "ajith2011", "massRange": [8, 20], "templates": [{"primaryMassSolar": 9}]}');
    const cases: [string[], RegExp][] = [
      [["bank", "--mass-range", "3:1", "--fmin", "30", "--out", out], /--mass-range: MIN must be below MAX/],
      [["bank", ...region, "--match-floor", "1.5", "--out", out], /--match-floor/],
      [["bank", "--mass-range", "8:20", "--fmin", "500", "--out", out], /--fmin: .*ISCO/],
      // Too narrow a band to tell chirps apart (templateBank.ts, MIN_FMAX_OVER_FMIN and MIN_ISCO_OVER_FMIN).
      [["bank", ...region, "--fmax", "24", "--out", out], /--fmax: 24 Hz must be at least 26 Hz \(1\.3 × fmin 20 Hz\)/],
      [["scan", demoStrain, "--mass-range", "1:3", "--fmin", "700"], /--fmin: 700 Hz must be at most 666\.2 Hz: the heaviest binary/],
      [["bank", "verify", broken], /broken\.json: templates\[0\] is missing "secondaryMassSolar"/],
      // Refused from the count estimate before any placement (these would run for minutes or forever).
      [["bank", "--mass-range", "0.001:0.01", "--fmin", "30", "--out", out], /--mass-range: .* needs about 1\.6e\+11 templates, more than the limit of 1000000/],
      // Outside the masses chirpsieve models (physics/massDomain.ts).
      [["bank", "--mass-range", "1e-9:1e-8", "--fmin", "30", "--out", out], /--mass-range: component masses must lie within 0\.001–100000 M_sun/],
      [["bank", "sweep", "--mass-range", "1:50", "--fmin", "20", "--match-floor", "0.9999"], /minimal match 0\.9999 needs about .* --template-cap/],
      [["bank", ...region, "--out", out, "--template-cap", "10"], /needs about .* more than the limit of 10;/],
      [["bank", ...region, "--out", out, "--template-cap", "0"], /--template-cap: must be at least 1/],
      [["scan", demoStrain, "--mass-range", "0.1:100", "--fmin", "10"], /--mass-range: .* needs about .* templates.*pass --bank/],
    ];
    const results = await runCliAll(cases.map(([args]) => args));
    results.forEach((r, i) => expectOneLineError(r, cases[i][1]));
  });
});

describe("chirpsieve bank: the edge of the inspiral", () => {
  it("records the inspiral share in the JSON summary and does not warn for a neutron-star bank", () => {
    const r = runCli(["bank", "--mass-range", "1:2", "--fmin", "30", "--noise-curve", "ajith2011", "--match-floor", "0.9", "--out", join(dir, "light.json"), "--json"]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toBe("");
    const doc = JSON.parse(r.stdout);
    expect(doc.inspiralEdge.threshold).toBe(0.9);
    expect(doc.inspiralEdge.below).toBe(0);
    expect(doc.inspiralEdge.totalMassRangeSolar).toBeNull();
    expect(doc.inspiralEdge.lowestShare).toBeGreaterThan(0.999);
  });
  it("names the mass range of the templates below 0.9 in the summary of a heavy bank", () => {
    const r = runCli(["bank", "--mass-range", "20:40", "--fmin", "30", "--noise-curve", "ajith2011", "--match-floor", "0.9", "--out", join(dir, "heavy.json"), "--json"]);
    expect(r.code, r.stderr).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.inspiralEdge.below).toBe(doc.inspiralEdge.templates);
    expect(doc.inspiralEdge.totalMassRangeSolar[0]).toBeGreaterThanOrEqual(40 - 1e-9);
    expect(r.stderr).toMatch(/^chirpsieve: warning: \d+ of \d+ templates \(total mass 40\.0–80\.0 M_sun\)/);
  });
});
