import { resolveFftBackend } from "../fft/backends.js";
import type { FftBackendName } from "../fft/types.js";
import { colouredNoise } from "../noise/colouredNoise.js";
import { createGater, DEFAULT_GATE_SETTINGS } from "../noise/gating.js";
import type { PsdModel } from "../noise/psdModel.js";
import { createBankFilter, type PeakWindow } from "./bankFilter.js";
import { DEFAULT_BAND_POWER_LOSS } from "./outputRate.js";
import { chooseSegmentLayout, truncationSeconds } from "./scan.js";
import { createSegmentFilter } from "./segmentFilter.js";
import { segmentPsd } from "./segmentPsd.js";
import { templateSpins } from "./templateSpins.js";
import type { PsdMethod, SearchTemplate } from "./types.js";

/** What a search of an hour of data with a bank costs on this machine, and how that was found. */
export interface SearchCostEstimate {
  sampleRate: number;
  /** Samples per segment, and segments per hour of data (from the search's own segment layout). */
  segmentSamples: number;
  segmentsPerHour: number;
  /** Seconds of one core per segment that do not depend on the bank: PSD estimate, gating, forward transform. */
  perSegmentSeconds: number;
  /** Seconds of one core per template and segment: phase, product, inverse FFT at the template's rate, peaks. */
  perTemplateSegmentSeconds: number;
  /** Templates timed (spread evenly through the bank). */
  templatesTimed: number;
  templates: number;
  /** CPU seconds (one core) to search one hour of data with the whole bank. */
  cpuSecondsPerHour: number;
  backend: FftBackendName;
  method: string;
}

export interface SearchCostOptions {
  templates: readonly SearchTemplate[];
  fMinHz: number;
  sampleRate: number;
  /** Noise curve the timed segment is drawn from (its content does not change the cost). */
  psd: PsdModel;
  /** How the search gets its PSD (default a 4 s median Welch estimate, as `scan`). */
  psdMethod?: PsdMethod;
  /** Templates timed at most (default 48), spread evenly through the bank. */
  maxTimed?: number;
  backend?: FftBackendName;
  /**
   * Length of the data the search will be given (s, default 3600): the segment length follows it
   * (a search of short data uses shorter segments), as chooseSegmentLayout decides.
   */
  dataSeconds?: number;
  /** ε of the per-template output rate (default as the search); null: the full-rate path. */
  bandPowerLoss?: number | null;
}

/**
 * Times, on this machine and one core, what the search (searchEach.ts) does per segment and per template:
 * the segment layout the search would choose for an hour of data (chooseSegmentLayout), the
 * per-segment work (PSD, gating, forward transform and filter weights: segmentPsd, createGater,
 * SegmentFilter.load) on one segment of coloured noise, and the per-template kernel
 * (BankFilter.scan at each template's own output rate) over templates spread evenly through the
 * bank. CPU seconds per hour = segments per hour × (per-segment + templates × per-template).
 * The same functions the search runs, so the estimate follows the search as it changes.
 */
export function estimateSearchCost(o: SearchCostOptions): SearchCostEstimate {
  const fs = o.sampleRate;
  const backend = o.backend ?? resolveFftBackend("auto");
  const psdMethod: PsdMethod = o.psdMethod ?? { kind: "estimate", segmentSeconds: 4, average: "median" };
  const search = { templates: o.templates, fMinHz: o.fMinHz, snrThreshold: 6, chi2Bands: 0, loudestWithinSeconds: 1, psd: psdMethod };
  const layout = chooseSegmentLayout(search, fs, Math.round((o.dataSeconds ?? 3600) * fs));
  const n = layout.size;
  const stride = n - layout.invalidStart - layout.invalidEnd;
  const segmentsPerHour = (3600 * fs) / Math.max(1, stride);
  const fMax = 0.95 * (fs / 2);
  const trunc = Math.round(truncationSeconds(search) * fs);
  const data = colouredNoise(o.psd, n, fs, "search-cost");
  const filter = createSegmentFilter({ size: n, sampleRate: fs, fMinHz: o.fMinHz, fMaxHz: fMax, psd: psdMethod, truncationSamples: trunc, backend });
  const gater = createGater(n, fs, backend);
  const t0 = performance.now();
  const psd = segmentPsd(psdMethod, data, n, fs, n, o.fMinHz, trunc, backend);
  gater.apply(data, n, psd, o.fMinHz, fMax, DEFAULT_GATE_SETTINGS);
  filter.load(data, n, psd);
  const perSegmentSeconds = (performance.now() - t0) / 1000;
  const count = o.templates.length;
  const timed = Math.max(1, Math.min(o.maxTimed ?? 48, count));
  const picked: SearchTemplate[] = [];
  for (let i = 0; i < timed; i++) picked.push(o.templates[Math.floor(((i + 0.5) * count) / timed)]);
  const masses = new Float64Array(2 * timed);
  picked.forEach((t, i) => {
    masses[2 * i] = t.primaryMassSolar;
    masses[2 * i + 1] = t.secondaryMassSolar;
  });
  const spins = templateSpins(picked);
  const bandPowerLoss = o.bandPowerLoss === undefined ? DEFAULT_BAND_POWER_LOSS : o.bandPowerLoss;
  const bank = createBankFilter({ size: n, sampleRate: fs, fMinHz: o.fMinHz, fMaxHz: fMax, backend, ...(bandPowerLoss === null ? {} : { bandPowerLoss }) });
  const peaks: PeakWindow = { start: layout.invalidStart, end: n - layout.invalidEnd, threshold: 6, window: fs };
  const sigmas = new Float64Array(timed);
  try {
    // One untimed pass makes the plans and touches their memory, as a search's first segment does.
    bank.scan(filter.weights, masses, 0, timed, peaks, sigmas, [], spins);
    const t1 = performance.now();
    bank.scan(filter.weights, masses, 0, timed, peaks, sigmas, [], spins);
    const perTemplateSegmentSeconds = (performance.now() - t1) / 1000 / timed;
    return {
      sampleRate: fs,
      segmentSamples: n,
      segmentsPerHour,
      perSegmentSeconds,
      perTemplateSegmentSeconds,
      templatesTimed: timed,
      templates: count,
      cpuSecondsPerHour: segmentsPerHour * (perSegmentSeconds + count * perTemplateSegmentSeconds),
      backend,
      method:
        `the search's own kernel timed on this machine (one core, ${backend}): per-segment work on one ${n}-sample segment at ${fs} Hz ` +
        `and ${timed} of the ${count} templates at their own output rates, × ${segmentsPerHour.toFixed(1)} segments per hour of data`,
    };
  } finally {
    bank.dispose();
    filter.dispose();
  }
}
