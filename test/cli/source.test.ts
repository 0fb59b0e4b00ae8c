// `chirpsieve source`: end to end through the BUILT cli (run `npm run build` first) for the output
// and exit-code contract, in-process through commander for the many flag combinations, plus the
// unit parser of packages/cli/src/units.ts.
import { spawn } from "node:child_process";
import { Command } from "commander";
import { afterEach, describe, expect, it, vi } from "vitest";
import { AU, InputError, JULIAN_YEAR, M_SUN, PARSEC, chirpMass, describeBinary } from "@chirpsieve/core";
import { frequencyDerivative, timeToCoalescenceFromGwFrequency } from "../../packages/core/src/physics/chirp.js";
import { MPC } from "../../packages/core/src/physics/constants.js";
import { strainAmplitude } from "../../packages/core/src/physics/quadrupole.js";
import { CLI, type CliResult } from "./helpers.js";
import { registerSource } from "../../packages/cli/src/commands/source.js";
import { formatDuration, formatLength, formatNumber, parseQuantity } from "../../packages/cli/src/units.js";

/** Like helpers.runCli but asynchronous, so that the end-to-end cases below can run side by side. */
function runCliAsync(args: string[]): Promise<CliResult> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [CLI, ...args], { stdio: ["ignore", "pipe", "pipe"] });
    let stdout = "";
    let stderr = "";
    child.stdout.setEncoding("utf8").on("data", (s: string) => (stdout += s));
    child.stderr.setEncoding("utf8").on("data", (s: string) => (stderr += s));
    child.on("error", reject);
    child.on("close", (code) => resolve({ code: code ?? -1, stdout, stderr }));
  });
}

/** Runs `source ARGS…` in this process; returns stdout, or the error the command threw. */
async function runInProcess(args: string[]): Promise<{ stdout: string; error: Error | null }> {
  const program = new Command().exitOverride().configureOutput({ writeOut: () => {}, writeErr: () => {} });
  registerSource(program);
  for (const sub of program.commands) sub.exitOverride().configureOutput({ writeOut: () => {}, writeErr: () => {} });
  let stdout = "";
  const spy = vi.spyOn(process.stdout, "write").mockImplementation((chunk: string | Uint8Array) => {
    stdout += String(chunk);
    return true;
  });
  try {
    await program.parseAsync(["source", ...args], { from: "user" });
    return { stdout, error: null };
  } catch (err) {
    return { stdout, error: err as Error };
  } finally {
    spy.mockRestore();
  }
}

/** Expects `source ARGS…` to fail with an InputError (exit 2 in the CLI) whose one line names each of `mustName`. */
async function expectInputError(args: string[], ...mustName: string[]): Promise<string> {
  const { error } = await runInProcess(args);
  expect(error).toBeInstanceOf(InputError);
  const message = (error as Error).message;
  expect(message.split("\n")).toHaveLength(1);
  for (const name of mustName) expect(message).toContain(name);
  return message;
}

afterEach(() => vi.restoreAllMocks());

describe.concurrent("chirpsieve source, end to end", () => {
  it("describes two 1 M_sun stars 50 AU apart at 10 pc as one JSON object with the right values", async () => {
    const r = await runCliAsync(["source", "--masses", "1,1", "--separation", "50AU", "--distance", "10pc", "--json"]);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe("");
    const o = JSON.parse(r.stdout) as Record<string, number>;
    for (const key of [
      "chirpMassSolar", "totalMassSolar", "symmetricMassRatio", "orbitalPeriodSeconds", "orbitalFrequencyHz",
      "gwFrequencyHz", "gwPeriodSeconds", "separationMeters", "strainAmplitude", "frequencyDerivativeHzPerSecond",
      "timeToCoalescenceSeconds", "luminosityWatts", "iscoGwFrequencyHz", "orbitalPeriodDerivative", "distanceMeters",
    ]) {
      expect(typeof o[key], key).toBe("number");
    }
    const ref = describeBinary({ m1: M_SUN, m2: M_SUN, separation: 50 * AU, distance: 10 * PARSEC });
    expect(o.totalMassSolar).toBeCloseTo(2, 12);
    expect(o.chirpMassSolar).toBeCloseTo(2 ** -0.2, 12); // equal masses: Mc = M η^{3/5} = 2 · (1/4)^{3/5}
    expect(o.symmetricMassRatio).toBe(0.25);
    expect(o.separationMeters).toBeCloseTo(50 * AU, 0);
    expect(o.distanceMeters).toBeCloseTo(10 * PARSEC, -3);
    expect(o.orbitalPeriodSeconds / JULIAN_YEAR).toBeCloseTo(250, 0);
    expect(o.gwPeriodSeconds / o.orbitalPeriodSeconds).toBeCloseTo(0.5, 12);
    expect(o.gwFrequencyHz / o.orbitalFrequencyHz).toBeCloseTo(2, 12);
    expect(o.strainAmplitude / strainAmplitude(ref.chirpMass, ref.gwFrequency, 10 * PARSEC)).toBeCloseTo(1, 12);
    expect(o.frequencyDerivativeHzPerSecond / frequencyDerivative(ref.chirpMass, ref.gwFrequency)).toBeCloseTo(1, 12);
    expect(o.timeToCoalescenceSeconds / JULIAN_YEAR).toBeGreaterThan(1e12);
    expect(o.luminosityWatts / ref.luminosity!).toBeCloseTo(1, 12);
    expect(o.orbitalPeriodDerivative).toBeLessThan(0);
    expect(o.iscoGwFrequencyHz).toBeCloseTo(ref.iscoGwFrequency, 6);
  });

  it("prints the README demo as a readable aligned table with human units beside SI", async () => {
    const r = await runCliAsync(["source", "--masses", "1,1", "--separation", "50AU", "--distance", "10pc"]);
    expect(r.code).toBe(0);
    const out = r.stdout;
    expect(out).toMatch(/^Binary source: 1 \+ 1 M_sun, circular orbit/);
    expect(out).toMatch(/separation\s+50 AU\s+7\.48e12 m/);
    expect(out).toMatch(/orbital period\s+250 yr\s+7\.89e9 s/);
    expect(out).toMatch(/GW period\s+125 yr/);
    expect(out).toMatch(/distance\s+10 pc/);
    expect(out).toMatch(/time to coalescence\s+1\.004e24 yr/);
    expect(out).toContain("ISCO GW frequency");
    const lines = out.split("\n");
    const column = (label: string, value: string): number => {
      const line = lines.find((l) => l.startsWith(`  ${label} `));
      return line === undefined ? -1 : line.indexOf(value);
    };
    const human = [column("separation", "50 AU"), column("orbital period", "250 yr"), column("distance", "10 pc"), column("chirp mass", "0.8706 M_sun")];
    expect(human[0]).toBeGreaterThan(0);
    expect(new Set(human).size).toBe(1);
    const si = [column("separation", "7.48e12 m"), column("orbital period", "7.89e9 s"), column("GW frequency (2 x orbital)", "2.535e-10 Hz")];
    expect(si[0]).toBeGreaterThan(human[0]);
    expect(new Set(si).size).toBe(1);
    expect(out).not.toMatch(/NaN|undefined|null|Infinity/);
  });

  it("inverse form: returns the chirp mass and distance of a binary from its (f, ḟ, h0)", async () => {
    const mc = chirpMass(1.4 * M_SUN, 1.3 * M_SUN);
    const f = 60, d = 40 * MPC;
    const fdot = frequencyDerivative(mc, f);
    const h = strainAmplitude(mc, f, d);
    const r = await runCliAsync([
      "source", "--gw-frequency", `${f}Hz`, "--frequency-derivative", String(fdot), "--strain", String(h), "--json",
    ]);
    expect(r.code).toBe(0);
    const o = JSON.parse(r.stdout) as Record<string, number>;
    expect(o.chirpMassSolar / (mc / M_SUN)).toBeCloseTo(1, 10);
    expect(o.luminosityDistanceMeters / d).toBeCloseTo(1, 10);
    expect(o.timeToCoalescenceSeconds / timeToCoalescenceFromGwFrequency(mc, f)).toBeCloseTo(1, 10);
  });

  it.each([
    ["negative mass", ["--masses", "-1,1", "--separation", "50AU"], ["--masses", "-1"]],
    ["unknown unit", ["--masses", "1,1", "--separation", "50AUx"], ['--separation: unknown unit "AUx" in "50AUx" (use m, km, AU, pc, kpc, Mpc, Gpc or ly)']],
    ["missing quantity", ["--masses", "1,1"], ["--separation", "--gw-frequency", "--orbital-period"]],
    ["two conflicting quantities", ["--masses", "1,1", "--separation", "50AU", "--orbital-period", "250yr"], ["--separation", "--orbital-period"]],
    ["unknown option", ["--masses", "1,1", "--separation", "1AU", "--bogus"], ["--bogus"]],
  ])("bad input (%s): one stderr line naming the flag, exit 2, no stack trace", async (_what, args, names) => {
    const r = await runCliAsync(["source", ...args]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    const lines = r.stderr.trim().split("\n");
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/^chirpsieve: /);
    for (const name of names) expect(lines[0]).toContain(name);
    expect(r.stderr).not.toMatch(/\bat .*\.js:\d+/);
  });
});

describe("chirpsieve source, in process", () => {
  it("reads --gw-frequency and --orbital-period with units", async () => {
    const f = await runInProcess(["--masses", "1.4Msun,1.4Msun", "--gw-frequency", "10Hz", "--json"]);
    const of = JSON.parse(f.stdout) as Record<string, number>;
    expect(of.orbitalPeriodSeconds).toBeCloseTo(0.2, 14);
    expect(of.timeToCoalescenceSeconds / timeToCoalescenceFromGwFrequency(chirpMass(1.4 * M_SUN, 1.4 * M_SUN), 10)).toBeCloseTo(1, 10);
    const p = await runInProcess(["--masses", "1,1", "--orbital-period", "250yr", "--json"]);
    expect((JSON.parse(p.stdout) as Record<string, number>).separationMeters / AU).toBeCloseTo(50, 2);
  });

  it("applies --eccentricity to the period decay only and says so", async () => {
    const args = ["--masses", "1.438,1.390", "--orbital-period", "0.322997d", "--eccentricity", "0.6171"];
    const oe = JSON.parse((await runInProcess([...args, "--json"])).stdout) as Record<string, unknown>;
    expect(oe.orbitalPeriodDerivative as number).toBeCloseTo(-2.4e-12, 13);
    expect((oe.notes as string[]).join(" ")).toMatch(/eccentricity 0\.6171 enters only the orbital-period decay rate/);
    expect((await runInProcess(args)).stdout).toMatch(/eccentricity 0\.6171 enters only/);
  });

  it("says when the separation is inside the ISCO instead of printing an inspiral", async () => {
    const oi = JSON.parse((await runInProcess(["--masses", "10,10", "--separation", "100km", "--distance", "1Mpc", "--json"])).stdout) as Record<string, unknown>;
    expect(oi.insideIsco).toBe(true);
    expect(oi.timeToCoalescenceSeconds).toBeNull();
    expect(oi.strainAmplitude).toBeNull();
    const table = (await runInProcess(["--masses", "10,10", "--separation", "100km"])).stdout;
    expect(table).toMatch(/inside the ISCO/);
    expect(table).not.toMatch(/time to coalescence/);
  });

  it("adds h+ and h× with --inclination", async () => {
    const r = await runInProcess(["--masses", "1.4,1.4", "--gw-frequency", "100Hz", "--distance", "40Mpc", "--inclination", "90deg", "--json"]);
    const o = JSON.parse(r.stdout) as Record<string, number>;
    expect(o.strainPlus / o.strainAmplitude).toBeCloseTo(0.5, 12);
    expect(Math.abs(o.strainCross / o.strainAmplitude)).toBeLessThan(1e-12);
  });

  it("prints the inverse form as a table", async () => {
    const table = (await runInProcess(["--gw-frequency", "35Hz", "--frequency-derivative", "80Hz/s", "--strain", "1e-21"])).stdout;
    expect(table).toMatch(/chirp mass\s+30\.69 M_sun/);
    expect(table).toMatch(/luminosity distance\s+\S+ Mpc/);
    expect(table).toMatch(/upper bound/);
  });

  it.each([
    ["wrong dimension", ["--masses", "1,1", "--separation", "3Hz"], ["--separation", "is a frequency, expected a length"]],
    ["zero distance", ["--masses", "1,1", "--distance", "0", "--separation", "1AU"], ["--distance", "positive"]],
    ["NaN frequency", ["--masses", "1,1", "--gw-frequency", "NaN"], ["--gw-frequency", "NaN"]],
    ["one mass", ["--masses", "1", "--separation", "1AU"], ["--masses", "two values"]],
    ["nothing at all", [], ["--masses"]],
    ["inverse form with --masses", ["--masses", "1,1", "--gw-frequency", "30Hz", "--frequency-derivative", "1"], ["--masses", "--frequency-derivative"]],
    ["--strain with --masses", ["--masses", "1,1", "--gw-frequency", "30Hz", "--strain", "1e-21"], ["--masses", "--strain"]],
    ["inverse form without --gw-frequency", ["--frequency-derivative", "1"], ["--gw-frequency"]],
    ["eccentricity out of range", ["--masses", "1,1", "--separation", "1AU", "--eccentricity", "1"], ["--eccentricity", "[0, 1)"]],
    ["inclination without a unit", ["--masses", "1,1", "--separation", "1AU", "--distance", "1pc", "--inclination", "30"], ["--inclination", "deg"]],
    ["inclination without distance", ["--masses", "1,1", "--separation", "1AU", "--inclination", "30deg"], ["--inclination", "--distance"]],
    ["negative strain", ["--gw-frequency", "30Hz", "--frequency-derivative", "1", "--strain", "-1e-21"], ["--strain"]],
  ])("rejects %s with one line naming the flag", async (_what, args, names) => {
    await expectInputError(args, ...names);
  });
});

describe("units.ts", () => {
  it("parses quantities with units into SI", () => {
    expect(parseQuantity("--x", "50AU", "length")).toBe(50 * AU);
    expect(parseQuantity("--x", "3e5km", "length")).toBe(3e8);
    expect(parseQuantity("--x", "410 Mpc", "length")).toBe(410 * MPC);
    expect(parseQuantity("--x", "12pc", "length")).toBe(12 * PARSEC);
    expect(parseQuantity("--x", "100ly", "length")).toBeCloseTo(100 * 9.4607304725808e15, -3); // IAU light year
    expect(parseQuantity("--x", "250yr", "time")).toBe(250 * JULIAN_YEAR);
    expect(parseQuantity("--x", "2.5d", "time")).toBe(216000);
    expect(parseQuantity("--x", "35Hz", "frequency")).toBe(35);
    expect(parseQuantity("--x", "3mHz", "frequency")).toBeCloseTo(3e-3, 18);
    expect(parseQuantity("--x", "7", "length")).toBe(7);
    expect(parseQuantity("--x", "1.4", "mass")).toBe(1.4 * M_SUN);
    expect(parseQuantity("--x", "-30deg", "angle", { sign: "any" })).toBeCloseTo(-Math.PI / 6, 15);
  });

  it("rejects unknown units, wrong dimensions and non-positive values naming the flag", () => {
    expect(() => parseQuantity("--separation", "50AUx", "length")).toThrow(/^--separation: unknown unit "AUx"/);
    expect(() => parseQuantity("--separation", "3Hz", "length")).toThrow(/"3Hz" is a frequency, expected a length/);
    expect(() => parseQuantity("--period", "-2d", "time")).toThrow(/--period: must be positive/);
    expect(() => parseQuantity("--f", "", "frequency")).toThrow(/--f: expected a number/);
    expect(() => parseQuantity("--d", "1e999", "length")).toThrow(/--d: value out of range/);
  });

  it("formats values in human units", () => {
    expect(formatNumber(250.0047)).toBe("250");
    expect(formatNumber(7.48e12)).toBe("7.48e12");
    expect(formatNumber(3.7788e-24)).toBe("3.779e-24");
    expect(formatDuration(250 * JULIAN_YEAR)).toBe("250 yr");
    expect(formatDuration(0.1641)).toBe("164.1 ms");
    expect(formatLength(50 * AU)).toBe("50 AU");
    expect(formatLength(410 * MPC)).toBe("410 Mpc");
    expect(formatLength(17720)).toBe("17.72 km");
  });
});
