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
});
