import { afterAll, describe, expect, it } from "vitest";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { ajith2011, formatPsdTable, InputError, psdModelFromSpec } from "@chirpsieve/core";
import { parsePsdTable, readPsdTable } from "../../packages/core/src/noise/psdTable.js";

const dir = mkdtempSync(join(tmpdir(), "chirpsieve-psdtable-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("PSD tables", () => {
  it("round-trips formatPsdTable → readPsdTable exactly at the rows, skipping the DC bin", () => {
    const f = Float64Array.from({ length: 200 }, (_, i) => i * 10);
    const s = f.map((v) => ajith2011.evaluate(Math.max(v, 10)));
    const path = join(dir, "roundtrip.csv");
    writeFileSync(path, formatPsdTable(f, s, ["synthetic test curve"]));
    const m = readPsdTable(path);
    expect(m.fMinHz).toBe(10);
    expect(m.fMaxHz).toBe(1990);
    for (let i = 1; i < 200; i++) expect(m.evaluate(f[i])).toBe(s[i]);
    expect(m.evaluate(5)).toBe(Infinity);
    expect(m.evaluate(2000)).toBe(Infinity);
  });

  it("interpolates in log–log (exact for a power law) and reads whitespace, commas and comments", () => {
    const m = parsePsdTable("# f psd\n\n10  1e-40   # first\n100,1e-44\n1000 ,\t1e-48\n", "power.txt");
    // S = 1e-36 f^-4 between the rows.
    for (const f of [10, 20, 31.6, 500, 999]) expect(m.evaluate(f) / (1e-36 * f ** -4)).toBeCloseTo(1, 12);
    expect(m.name).toBe("power.txt");
  });

  it("names the file and line of a malformed row", () => {
    expect(() => parsePsdTable("10 1e-40\n20\n", "a.txt")).toThrow("a.txt line 2: expected two columns");
    expect(() => parsePsdTable("10 1e-40\n20 abc\n", "a.txt")).toThrow("a.txt line 2: PSD is not a finite number");
    expect(() => parsePsdTable("x 1e-40\n", "a.txt")).toThrow("a.txt line 1: frequency is not a number");
    expect(() => parsePsdTable("10 1e-40\n10 1e-41\n", "a.txt")).toThrow("a.txt line 2: frequencies must increase strictly");
    expect(() => parsePsdTable("# c\n10 1e-40\n20 0\n", "a.txt")).toThrow("a.txt line 3: PSD must be positive");
    expect(() => parsePsdTable("0 1e-40\n20 1e-41\n", "a.txt")).toThrow("a.txt line 1: frequency must be positive");
    expect(() => parsePsdTable("10 1e-40\n", "a.txt")).toThrow("a.txt: a PSD table needs at least two rows");
    expect(() => readPsdTable(join(dir, "missing.txt"))).toThrow(/missing\.txt: cannot read PSD table \(no such file\)/);
    expect(() => readPsdTable(dir)).toThrow(InputError);
  });

  it("psdModelFromSpec takes a known name or a table path", () => {
    expect(psdModelFromSpec("ajith2011")).toBe(ajith2011);
    expect(psdModelFromSpec("flat:2e-46").evaluate(100)).toBe(2e-46);
    const path = join(dir, "curve");
    writeFileSync(path, "10 1e-40\n100 1e-44\n");
    expect(psdModelFromSpec(path).evaluate(100)).toBe(1e-44);
    expect(() => psdModelFromSpec("nosuchcurve")).toThrow(/unknown noise curve "nosuchcurve"/);
    expect(() => psdModelFromSpec("nosuch/curve.txt")).toThrow(/nosuch\/curve\.txt: cannot read PSD table/);
  });
});
