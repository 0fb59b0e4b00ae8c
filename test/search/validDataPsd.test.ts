// The PSD of a series from its valid data only (search/validDataPsd.ts, welchPsd's intervals).
import { describe, expect, it } from "vitest";
import { InputError, ajith2011, colouredNoise, validDataPsd, welchPsd } from "@chirpsieve/core";

const FS = 2048;
const data = colouredNoise(ajith2011, 64 * FS, FS, "valid-data-psd");

/** The InputError a promise rejects with. */
async function inputErrorOf(p: Promise<unknown>): Promise<InputError> {
  const err = await p.then(() => undefined, (e: unknown) => e);
  expect(err).toBeInstanceOf(InputError);
  return err as InputError;
}

describe("welchPsd over intervals", () => {
  it("one interval over the whole series is the plain estimate, bit for bit", () => {
    const plain = welchPsd(data, FS, { segmentLength: 4096, average: "median" });
    const whole = welchPsd(data, FS, { segmentLength: 4096, average: "median", intervals: [{ start: 0, end: data.length }] });
    expect(whole.segments).toBe(plain.segments);
    expect(Array.from(whole.psd)).toEqual(Array.from(plain.psd));
  });

  it("a mean over two intervals is the segment-weighted mean of each interval's own estimate", () => {
    const a = { start: 0, end: 20 * FS };
    const b = { start: 30 * FS, end: 64 * FS };
    const both = welchPsd(data, FS, { segmentLength: 4096, average: "mean", intervals: [a, b] });
    const pa = welchPsd(data.slice(a.start, a.end), FS, { segmentLength: 4096, average: "mean" });
    const pb = welchPsd(data.slice(b.start, b.end), FS, { segmentLength: 4096, average: "mean" });
    expect([pa.segments, pb.segments, both.segments]).toEqual([19, 33, 52]); // ⌊(L − 4096)/2048⌋ + 1 each
    for (let k = 0; k < both.psd.length; k += 37) {
      const expected = (pa.segments * pa.psd[k] + pb.segments * pb.psd[k]) / 52;
      expect(Math.abs(both.psd[k] / expected - 1)).toBeLessThan(1e-12);
    }
  });

  it("refuses intervals outside the data, and intervals none of which holds a segment", () => {
    expect(() => welchPsd(data, FS, { segmentLength: 4096, intervals: [{ start: 0, end: data.length + 1 }] })).toThrow(InputError);
    expect(() => welchPsd(data, FS, { segmentLength: 4096, intervals: [{ start: 0, end: 4095 }] })).toThrow(/no interval holds one segment/);
  });
});

describe("validDataPsd", () => {
  const withZeros = data.slice();
  withZeros.fill(0, 20 * FS, 30 * FS);
  const series = { file: "gappy.f64", sampleRate: FS, startTime: 100, data: withZeros };

  it("refuses a zero-filled stretch as the search does: one line naming the file, time and kind", async () => {
    const err = await inputErrorOf(validDataPsd(series, { segmentSeconds: 2, average: "median" }));
    expect(err.message).toBe(
      "gappy.f64: zero-filled samples at t = 120.0000 s (samples 40960–61439, 10.0 s); bad data are rejected unless the PSD estimate is told to leave them out",
    );
    expect(err.parameter).toBe("badData");
    const nan = data.slice();
    nan[5 * FS] = Number.NaN;
    const e2 = await inputErrorOf(validDataPsd({ ...series, data: nan }, { segmentSeconds: 2, average: "median" }));
    expect(e2.message).toMatch(/^gappy\.f64: non-finite samples \(NaN or infinite\) at t = 105\.0000 s/);
  });

  it("leaving bad data out estimates from the stretches around it only", async () => {
    const r = await validDataPsd(series, { segmentSeconds: 2, average: "mean", badData: "exclude" });
    expect(r.excluded).toEqual([{ start: 20 * FS, end: 30 * FS, reason: "zero-filled samples" }]);
    expect(r.excludedSamples).toBe(10 * FS);
    const expected = welchPsd(data, FS, { segmentLength: 4096, average: "mean", intervals: [{ start: 0, end: 20 * FS }, { start: 30 * FS, end: 64 * FS }] });
    expect(r.estimate.segments).toBe(52);
    expect(Array.from(r.estimate.psd)).toEqual(Array.from(expected.psd));
    // Estimated from noise alone: within 5% of the model over the bucket (mean of 52 segments).
    let ratio = 0;
    for (let k = 100; k < 900; k++) ratio += r.estimate.psd[k] / ajith2011.evaluate(k * r.estimate.df);
    expect(Math.abs(ratio / 800 - 1)).toBeLessThan(0.05);
  });

  it("clean data is the plain Welch estimate", async () => {
    const r = await validDataPsd({ ...series, data }, { segmentSeconds: 2, average: "median" });
    expect(r.excluded).toEqual([]);
    expect(Array.from(r.estimate.psd)).toEqual(Array.from(welchPsd(data, FS, { segmentLength: 4096, average: "median" }).psd));
  });

  it("nothing left, or no valid stretch as long as a segment, is an InputError", async () => {
    const zeros = { ...series, data: new Float64Array(8 * FS) };
    expect((await inputErrorOf(validDataPsd(zeros, { segmentSeconds: 2, average: "median", badData: "exclude" }))).message).toBe(
      "gappy.f64: nothing is left after leaving out bad data; there is no PSD to estimate",
    );
    const e = await inputErrorOf(validDataPsd(series, { segmentSeconds: 64, average: "median", badData: "exclude" }));
    expect(e.parameter).toBe("segmentSeconds");
    expect(e.detail).toContain("longer than every stretch of valid data in gappy.f64 (the longest: 69632 samples");
  });
});
