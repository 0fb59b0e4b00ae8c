// Memory of a scan is bounded by the segment length, not by the length of the input: a 4-hour
// input at 4096 Hz, synthesised on the fly by each read (so the input itself holds nothing), is
// scanned within a fixed RSS bound, not far above the peak of a 10-minute scan.
import seedrandom from "seedrandom";
import { beforeAll, describe, expect, it } from "vitest";
import { loadFftBackends, searchStrain, type SearchInput, type SearchOptions } from "@chirpsieve/core";
import { flatPsd } from "../../packages/core/src/noise/psdModel.js";

const FS = 4096;
const BLOCK = 1 << 16;

/**
 * Pseudo-white Gaussian noise of one-sided PSD `level` (variance level·fs/2; common practice, no
 * source) as a SearchInput that synthesises every read. A table of 2^16 normal deviates is drawn
 * once (seedrandom, Box–Muller); block b of 2^16 samples reads the table in an order and with
 * signs drawn from seedrandom(`${seed}:${b}`) (a stride coprime to 2^16 and an offset), so any
 * range is reproducible, cheap to make, and nothing but the returned samples is kept.
 */
function generatedNoise(seconds: number, seed: string, level = 1e-46): SearchInput {
  const sigma = Math.sqrt((level * FS) / 2);
  const table = new Float64Array(BLOCK);
  const draw = seedrandom(`${seed}:table`);
  for (let i = 0; i < BLOCK; i += 2) {
    const r = Math.sqrt(-2 * Math.log(1 - draw()));
    const a = 2 * Math.PI * draw();
    table[i] = sigma * r * Math.cos(a);
    table[i + 1] = sigma * r * Math.sin(a);
  }
  return {
    file: `<generated ${seconds} s>`,
    sampleRate: FS,
    startTime: 0,
    length: Math.round(seconds * FS),
    async read(offset, count) {
      const out = new Float64Array(count);
      let b = -1, stride = 1, shift = 0, sign = 1;
      for (let i = 0; i < count; i++) {
        const j = offset + i;
        if (Math.floor(j / BLOCK) !== b) {
          b = Math.floor(j / BLOCK);
          const rng = seedrandom(`${seed}:${b}`);
          stride = 2 * Math.floor(rng() * (BLOCK / 2)) + 1;
          shift = Math.floor(rng() * BLOCK);
          sign = rng() < 0.5 ? -1 : 1;
        }
        out[i] = sign * table[((j % BLOCK) * stride + shift) & (BLOCK - 1)];
      }
      return out;
    },
  };
}

const options: SearchOptions = {
  templates: [
    { primaryMassSolar: 12, secondaryMassSolar: 10 },
    { primaryMassSolar: 9, secondaryMassSolar: 7 },
  ],
  fMinHz: 40,
  snrThreshold: 6,
  chi2Bands: 16,
  loudestWithinSeconds: 1,
  psd: { kind: "model", model: flatPsd() },
  fftBackend: "pffft",
  threads: 1,
};

/** Peak RSS (bytes) sampled after every segment of a scan, and the scan's summary. */
async function scanPeakRss(input: SearchInput) {
  let peak = process.memoryUsage().rss;
  const result = await searchStrain(input, {
    ...options,
    onProgress: () => {
      peak = Math.max(peak, process.memoryUsage().rss);
    },
  });
  return { peak: Math.max(peak, process.memoryUsage().rss), summary: result.summary };
}

beforeAll(async () => {
  await loadFftBackends();
});

describe("memory of a long scan", () => {
  // The first scan's growth is the machinery (WebAssembly memory, JIT code, buffers, a lazily
  // collected heap); what must not grow is the peak from a 10-minute to a 4-hour input.
  it("scans 4 hours at 4096 Hz within 48 MB of a 10-minute scan's peak RSS, and within 192 MB of RSS above the start (the series would take 450 MB)", async () => {
    const MB = 1024 * 1024;
    const start = process.memoryUsage().rss;
    const short = await scanPeakRss(generatedNoise(600, "memory-short"));
    const long = await scanPeakRss(generatedNoise(4 * 3600, "memory-long"));
    expect(long.summary.analysedSeconds).toBeGreaterThan(4 * 3600 - 60);
    expect(long.peak - start).toBeLessThan(192 * MB);
    expect(long.peak - short.peak).toBeLessThan(48 * MB);
  });
});
