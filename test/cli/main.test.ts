import { describe, expect, it } from "vitest";
import { runCli } from "./helpers.js";

describe("chirpsieve entry point", () => {
  it("prints help and exits 0", () => {
    const r = runCli(["--help"]);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain("Usage: chirpsieve");
  });

  it("rejects an unknown option with one line on stderr and exit code 2", () => {
    const r = runCli(["--no-such-flag"]);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split("\n")).toHaveLength(1);
    expect(r.stderr).toContain("--no-such-flag");
    expect(r.stderr).not.toMatch(/\bat .*\.js:\d+/);
  });

  it("prints each option's default at most once in every command's help", () => {
    const commands = [["scan"], ["recover"], ["bank"], ["bank", "verify"], ["bank", "sweep"], ["simulate"], ["psd"], ["source"], ["sites"], ["merge"]];
    for (const cmd of commands) {
      const r = runCli([...cmd, "--help"]);
      expect(r.code, cmd.join(" ")).toBe(0);
      // One entry per option: a line starting with "  -" and its wrapped continuation lines.
      for (const entry of r.stdout.split(/\n(?=\s{2}-)/)) {
        expect((entry.match(/\(default:/g) ?? []).length, `${cmd.join(" ")}: ${entry}`).toBeLessThanOrEqual(1);
      }
    }
  });

  it("names the shared search options and the bank caps as the README does", () => {
    for (const cmd of ["scan", "recover"]) {
      const help = runCli([cmd, "--help"]).stdout;
      for (const flag of ["--loudest-within", "--welch-segment", "--welch-average", "--bank-noise-curve"]) expect(help, `${cmd}: ${flag}`).toContain(flag);
    }
    const bank = runCli(["bank", "build", "--help"]).stdout;
    for (const flag of ["--total-mass-cap", "--mass-ratio-cap", "--template-cap"]) expect(bank).toContain(flag);
    expect(runCli(["sites", "--help"]).stdout).toContain("armBearingsDegrees");
  });
});
