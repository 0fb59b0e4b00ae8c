// The FFT backends (fft.js in double precision, pffft-wasm in single precision) give the same
// search result for the same injection.
import { beforeAll, describe, expect, it } from "vitest";
import { ajith2011, arrayInput, loadFftBackends, searchStrain, type SearchOptions } from "@chirpsieve/core";
import { arrivalTime, atSnr, chirpMassGrid, injectionAt, simulatedData } from "../search/fixtures.js";

const FS = 2048;
const FMIN = 30;

beforeAll(async () => {
  await loadFftBackends();
});

describe("FFT backends agree on the search output", () => {
  for (const psd of ["model", "estimate"] as const) {
    it(`the SNR of the same injection differs by < 1e-3 relative between pffft and fftjs (${psd} PSD)`, async () => {
      const inj = atSnr(injectionAt(10, 8, 80.5), 12, ajith2011, FS, FMIN);
      const data = simulatedData({ psd: ajith2011, fs: FS, seconds: 128, seed: "backends", fMin: FMIN, injections: [inj] });
      const base: Omit<SearchOptions, "fftBackend"> = {
        templates: chirpMassGrid(7, 9, 0.01, [1, 0.8]),
        fMinHz: FMIN,
        snrThreshold: 6,
        chi2Bands: 16,
        loudestWithinSeconds: 1,
        psd: psd === "model" ? { kind: "model", model: ajith2011 } : { kind: "estimate", segmentSeconds: 4, average: "median" },
        threads: 1,
      };
      const loudest = async (fftBackend: "pffft" | "fftjs") => {
        const { candidates, summary } = await searchStrain(arrayInput(data, FS), { ...base, fftBackend });
        expect(summary.fftBackend).toBe(fftBackend);
        return candidates.reduce((a, b) => (b.snr > a.snr ? b : a));
      };
      const a = await loudest("pffft");
      const b = await loudest("fftjs");
      expect(Math.abs(a.coalescenceTime - arrivalTime(inj))).toBeLessThan(0.005);
      expect(a.templateIndex).toBe(b.templateIndex);
      expect(Math.abs(a.snr / b.snr - 1)).toBeLessThan(1e-3);
      expect(Math.abs(a.coalescenceTime - b.coalescenceTime)).toBeLessThan(1e-4);
      expect(Math.abs(a.chi2 - b.chi2)).toBeLessThan(1e-2 * Math.max(1, b.chi2));
    });
  }
});
