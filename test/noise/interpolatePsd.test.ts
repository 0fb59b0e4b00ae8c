import { describe, expect, it } from "vitest";
import { ajith2011 } from "@chirpsieve/core";
import { interpolatePsd, isSampledPsd, sampledPsdModel } from "../../packages/core/src/noise/interpolatePsd.js";

describe("interpolatePsd and sampledPsdModel", () => {
  const df = 0.25;
  const psd = new Float64Array(8193);
  for (let k = 0; k < psd.length; k++) psd[k] = ajith2011.evaluate(Math.max(k * df, 10));

  it("returns the bins unchanged on the same grid and +Infinity beyond the last bin", () => {
    const same = interpolatePsd({ df, psd }, df, psd.length + 2);
    for (let k = 0; k < psd.length; k++) expect(same[k]).toBe(psd[k]);
    expect(same[psd.length]).toBe(Infinity);
  });

  it("resamples onto a finer grid within 1e-4 of the model above 20 Hz (geometric interpolation)", () => {
    const fine = interpolatePsd({ df, psd }, 1 / 16, 32769);
    let worst = 0;
    for (let k = 20 * 16; k < 32769; k++) worst = Math.max(worst, Math.abs(fine[k] / ajith2011.evaluate(k / 16) - 1));
    expect(worst).toBeLessThan(1e-4);
  });

  it("evaluates a model on a grid and views a sampled PSD as a model", () => {
    const grid = interpolatePsd(ajith2011, 1, 100);
    expect(grid[50]).toBe(ajith2011.evaluate(50));
    const m = sampledPsdModel({ df, psd }, "estimate");
    expect(m.fMinHz).toBe(df);
    expect(m.fMaxHz).toBe(2048);
    expect(m.evaluate(100)).toBe(psd[400]);
    expect(m.evaluate(3000)).toBe(Infinity);
    expect(isSampledPsd({ df, psd })).toBe(true);
    expect(isSampledPsd(ajith2011)).toBe(false);
  });

  it("rejects a bad grid", () => {
    expect(() => interpolatePsd({ df: 0, psd }, 1, 10)).toThrow(/df must be a positive/);
    expect(() => interpolatePsd(ajith2011, -1, 10)).toThrow(/dfHz/);
    expect(() => interpolatePsd(ajith2011, 1, 0)).toThrow(/length/);
  });
});
