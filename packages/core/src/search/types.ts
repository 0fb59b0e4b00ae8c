import type { FftBackendChoice, FftBackendName } from "../fft/types.js";
import type { PsdModel } from "../noise/psdModel.js";
import type { GateSettings } from "../noise/gating.js";
import type { SegmentHook } from "./segmentHook.js";
import type { TimeInterval } from "./streamPlan.js";

/**
 * What the search reads: a uniformly sampled series read in pieces (io's StrainReader fits).
 * read(offset, count) returns samples [offset, offset + count).
 */
export interface SearchInput {
  readonly file: string;
  readonly sampleRate: number;
  readonly startTime: number;
  readonly length: number;
  read(offset: number, count: number): Promise<Float64Array>;
  /** The file holding time t (s), for inputs joined from several files; default `file`. */
  fileAt?(time: number): string;
}

/** A template the search filters with: component masses in solar masses, optional aligned spins χ ∈ (−1, 1) (default 0). */
export interface SearchTemplate {
  readonly primaryMassSolar: number;
  readonly secondaryMassSolar: number;
  readonly primarySpin?: number;
  readonly secondarySpin?: number;
}

/** Where each segment's noise PSD comes from. */
export type PsdMethod =
  | { readonly kind: "model"; readonly model: PsdModel }
  | { readonly kind: "estimate"; readonly segmentSeconds: number; readonly average: "median" | "mean" };

/** Everything the search needs besides the data. */
export interface SearchOptions {
  readonly templates: readonly SearchTemplate[];
  /** Low-frequency cutoff of the templates and of the inner product (Hz). */
  readonly fMinHz: number;
  /** High-frequency cutoff of the inner product (Hz); default 0.95 × Nyquist. */
  readonly fMaxHz?: number;
  /** Peaks with |z| below this are not reported. */
  readonly snrThreshold: number;
  /** Number of frequency bands p of the chi-squared discriminator (0 turns it off). */
  readonly chi2Bands: number;
  /**
   * Allowance δ ≥ 0 for the chi-squared of imperfectly matched signals: the reweighted SNR divides
   * χ² by dof + δ ρ² instead of dof (filter/reweight.ts). Default 0 (Babak et al. 2013 exactly).
   */
  readonly chi2Allowance?: number;
  /** Keep the loudest peak within ± this many seconds, across time and the bank. */
  readonly loudestWithinSeconds: number;
  readonly psd: PsdMethod;
  /** Length of the truncated inverse-PSD filter (s); default the PSD estimate's segment, or 2 s for a model. */
  readonly truncationSeconds?: number;
  /** Segment length (s), rounded up to a power of two samples; default chosen from the longest template. */
  readonly segmentSeconds?: number;
  /**
   * Filter each template at the output rate its band needs (default true; search/outputRate.ts):
   * its band is cut where it keeps 1 − `bandPowerLoss` of its SNR², it costs an inverse FFT of the
   * smallest power-of-two length holding that band, and its peaks are refined to full-rate
   * samples (filter/bandLimitedPeaks.ts). false: one full-length inverse FFT per template.
   */
  readonly perTemplateRate?: boolean;
  /**
   * ε of the per-template rate: the fraction of its SNR² a template may lose to the band cut,
   * in (0, 0.1]; default DEFAULT_BAND_POWER_LOSS = 1e-3 (an SNR loss of at most 0.05%).
   */
  readonly bandPowerLoss?: number;
  /** FFT backend: "auto" (default: pffft once loadFftBackends() has loaded it in this thread, else fft.js), "pffft" or "fftjs". */
  readonly fftBackend?: FftBackendChoice;
  /**
   * What to do with stretches of unusable samples — non-finite, constant or zero-filled, corrupt
   * (search/dataQuality.ts): "reject" (default) makes them an InputError naming the input and the
   * stretch; "exclude" leaves them out (and reports them), with the filter lengths they force, and
   * searches the rest; "ignore" does not look (noise-free simulations, which are mostly zeros).
   */
  readonly badData?: "reject" | "exclude" | "ignore";
  /** Search only inside these time intervals (s, the input's time base); default everywhere. */
  readonly analysisIntervals?: readonly TimeInterval[];
  /** Never search inside these time intervals. */
  readonly excludedIntervals?: readonly TimeInterval[];
  /**
   * Gating of loud transients before filtering (noise/gating.ts); default DEFAULT_GATE_SETTINGS,
   * null turns it off.
   */
  readonly gating?: GateSettings | null;
  /**
   * Worker threads that filter the bank (≥ 1; 1 filters on the calling thread). Default
   * os.availableParallelism() when the library runs compiled (1 when it runs as TypeScript source,
   * or when the job is too small to gain: templates × segments × segment samples < 2^25).
   * The candidates do not depend on it.
   */
  readonly threads?: number;
  /** Called after each segment with (segments done, segments in all). */
  readonly onProgress?: (done: number, total: number) => void;
  /** Search only some segments with some templates and record each segment's outcome (sharding, resume; see shardRun.ts). */
  readonly segmentHook?: SegmentHook;
}

/** One reported peak. A candidate, not a detection. */
export interface Candidate {
  /** Time the template reaches its ISCO frequency (s, the file's time base). */
  coalescenceTime: number;
  snr: number;
  /** Phase of the complex SNR at the peak (rad). */
  phase: number;
  chi2: number;
  chi2Dof: number;
  reweightedSnr: number;
  primaryMassSolar: number;
  secondaryMassSolar: number;
  chirpMassSolar: number;
  /** Aligned spins of the template (0 for a non-spinning one). */
  primarySpin: number;
  secondarySpin: number;
  /** Effective spin of the template, χ_eff = (m1 χ1 + m2 χ2) / (m1 + m2). */
  effectiveSpin: number;
  /** Distance (Mpc) at which an optimally oriented source matching the template gives this SNR. */
  effectiveDistanceMpc: number;
  templateIndex: number;
  file: string;
}

/** A stretch of data that was not searched, and why. */
export interface SkippedStretch {
  startTime: number;
  endTime: number;
  reason: string;
}

/** A gate applied to the data before filtering (noise/gating.ts). */
export interface GateRecord {
  /** Time of the loudest whitened excursion (s, the input's time base). */
  time: number;
  /** Length of the zeroed stretch (s); cosine tapers lie outside it. */
  zeroedSeconds: number;
  /** Its |whitened| peak in robust standard deviations. */
  peakSigma: number;
}

/** What a scan of one input covered. */
export interface SearchSummary {
  file: string;
  templates: number;
  segments: number;
  segmentSamples: number;
  sampleRate: number;
  analysedSeconds: number;
  /** Length of the input (s). */
  dataSeconds: number;
  /**
   * Seconds at the start of the input in which no coalescence can be found: the longest template's
   * duration before its coalescence plus the inverse-PSD filter; and at the end, the filter.
   */
  leadInSeconds: number;
  tailSeconds: number;
  /** Seconds left out before filtering: bad data, excluded intervals, outside the analysis intervals. */
  skippedSeconds: number;
  /** The stretches left out, each with its reason (stretches of different reasons may overlap). */
  skipped: SkippedStretch[];
  /** Seconds of valid data where no coalescence time can be searched: the filter's lead-in and tail at each interval's edges. */
  lostToEdgesSeconds: number;
  /** Valid intervals searched separately (1 for clean data). */
  intervals: number;
  /** Loud transients gated out before filtering. */
  gates: GateRecord[];
  /** Why nothing could be searched, when `segments` is 0 ... */
  unsearchable?: string;
  /** ... and what needed most of the data: the longest template, or the inverse-PSD filter. */
  unsearchableLimitedBy?: "template" | "filter";
  fftBackend: FftBackendName;
  /** Threads that filtered the bank. */
  threads: number;
  wallSeconds: number;
}
