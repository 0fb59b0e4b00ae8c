// The search options `scan` and `recover` share: one definition, one parser, one bank choice, so
// an injection campaign runs exactly the search a scan runs.
import type { Command } from "commander";
import {
  buildBank,
  buildSpinBank,
  DEFAULT_GATE_SETTINGS,
  type GateSettings,
  maxSearchThreads,
  psdModelFromSpec,
  THREADS_PER_CORE_LIMIT,
  readBankFile,
  type FftBackendChoice,
  type SearchTemplate,
} from "@chirpsieve/core";
import { UsageError, withBankFlagErrors } from "./errors.js";
import { parseChoiceFlag, parseNumberFlag } from "./options.js";

/** Raw values of the shared flags, as commander hands them over. */
export interface SearchFlags {
  bank?: string;
  matchFloor: string;
  bankNoiseCurve?: string;
  noiseCurve?: string;
  fmin: string;
  minSnr: string;
  chi2Bands: string;
  chi2Allowance: string;
  loudestWithin: string;
  welchSegment: string;
  welchAverage: string;
  segment?: string;
  fft: string;
  threads?: string;
  gateThreshold: string;
  gateHalfWidth: string;
  gateTaper: string;
}

/** Default Welch segment of a scan's PSD estimate (s), which is also its inverse-PSD filter length. */
export const DEFAULT_PSD_SEGMENT_SECONDS = 4;

/** Adds the shared search flags to a command (`--fmin` default differs between commands). */
export function addSearchOptions(cmd: Command, defaults: { fmin: string }): Command {
  return cmd
    .option("--bank <file>", "template bank file written by `chirpsieve bank`")
    .option("--match-floor <mm>", "minimal match of a bank built on the fly over --mass-range", "0.97")
    .option("--bank-noise-curve <name|file>", "noise curve used to place a bank built on the fly (default: --noise-curve, else ajith2011)")
    .option("--fmin <Hz>", "low-frequency cutoff of templates and filter (Hz)", defaults.fmin)
    .option("--min-snr <rho>", "report peaks with SNR at or above this", "6")
    .option("--chi2-bands <p>", "frequency bands of the chi-squared discriminator (0 = off)", "16")
    .option(
      "--chi2-allowance <delta>",
      "chi-squared a signal may carry from imperfect template match, as a fraction of SNR²: the reweighted SNR divides chi-squared by dof + delta·SNR² (0 = off; ~0.03 lets signals of another waveform model keep their SNR; larger values weaken glitch rejection)",
      "0",
    )
    .option("--loudest-within <s>", "keep the loudest peak within ± this many seconds", "1")
    .option("--welch-segment <s>", "Welch segment length of the PSD estimate (s)", String(DEFAULT_PSD_SEGMENT_SECONDS))
    .option("--welch-average <kind>", "how the Welch segments are averaged: median (bias-corrected) or mean", "median")
    .option("--fft <backend>", "FFT backend: auto, pffft or fftjs", "auto")
    .option("--threads <n>", "worker threads filtering the bank (default: the number of cores; small jobs use 1)")
    .option("--gate-threshold <sigma>", "gate (zero) whitened data beyond this many standard deviations before filtering: loud transients (0 = off)", String(DEFAULT_GATE_SETTINGS.thresholdSigma))
    .option("--gate-half-width <s>", "half-width of the zeroed stretch around a gated transient (s)", String(DEFAULT_GATE_SETTINGS.halfWidthSeconds))
    .option("--gate-taper <s>", "cosine taper on each side of a gate (s)", String(DEFAULT_GATE_SETTINGS.taperSeconds));
}

/** The shared flags, parsed and checked; every error names its flag. */
export interface ParsedSearchFlags {
  fMinHz: number;
  snrThreshold: number;
  chi2Bands: number;
  chi2Allowance: number;
  loudestWithinSeconds: number;
  welchSegmentSeconds: number;
  welchAverage: "median" | "mean";
  segmentSeconds: number | undefined;
  fftChoice: FftBackendChoice;
  threads: number | undefined;
  /** null: gating off. */
  gating: GateSettings | null;
}

export function parseSearchFlags(flags: SearchFlags): ParsedSearchFlags {
  const chi2Bands = parseNumberFlag("--chi2-bands", flags.chi2Bands, { min: 0, integer: true });
  if (chi2Bands === 1) throw new UsageError("--chi2-bands: must be 0 (off) or at least 2 (got 1)");
  return {
    fMinHz: parseNumberFlag("--fmin", flags.fmin, { min: 0, minExclusive: true }),
    snrThreshold: parseNumberFlag("--min-snr", flags.minSnr, { min: 0, minExclusive: true }),
    chi2Bands,
    chi2Allowance: parseNumberFlag("--chi2-allowance", flags.chi2Allowance, { min: 0 }),
    loudestWithinSeconds: parseNumberFlag("--loudest-within", flags.loudestWithin, { min: 0, minExclusive: true }),
    welchSegmentSeconds: parseNumberFlag("--welch-segment", flags.welchSegment, { min: 0, minExclusive: true }),
    welchAverage: parseChoiceFlag("--welch-average", flags.welchAverage, ["median", "mean"] as const),
    segmentSeconds: flags.segment === undefined ? undefined : parseNumberFlag("--segment", flags.segment, { min: 0, minExclusive: true }),
    fftChoice: parseChoiceFlag("--fft", flags.fft, ["auto", "pffft", "fftjs"] as const),
    threads: flags.threads === undefined ? undefined : capThreads(parseNumberFlag("--threads", flags.threads, { min: 1, integer: true })),
    gating: parseGateFlags(flags),
  };
}

/** --gate-threshold (0 = off), --gate-half-width, --gate-taper. */
function parseGateFlags(flags: SearchFlags): GateSettings | null {
  const thresholdSigma = parseNumberFlag("--gate-threshold", flags.gateThreshold, { min: 0 });
  const halfWidthSeconds = parseNumberFlag("--gate-half-width", flags.gateHalfWidth, { min: 0 });
  const taperSeconds = parseNumberFlag("--gate-taper", flags.gateTaper, { min: 0 });
  if (thresholdSigma === 0) return null;
  if (thresholdSigma < 5) throw new UsageError(`--gate-threshold: ${thresholdSigma} σ would gate Gaussian noise itself; use at least 5, or 0 for no gating`);
  return { thresholdSigma, halfWidthSeconds, taperSeconds };
}

/** --threads above THREADS_PER_CORE_LIMIT × the cores is capped there, with a note on stderr. */
function capThreads(threads: number): number {
  const most = maxSearchThreads();
  if (threads <= most) return threads;
  process.stderr.write(
    `chirpsieve: note: --threads ${threads} capped at ${most} (${THREADS_PER_CORE_LIMIT} per core on this machine's ${most / THREADS_PER_CORE_LIMIT} cores; more only add memory)\n`,
  );
  return most;
}

/**
 * The templates to search with and the low-frequency cutoff to search from: a bank file (--bank)
 * brings its own fmin, used unless --fmin was typed (a typed --fmin that differs gets a note on
 * stderr: the bank's coverage was verified from its own fmin); otherwise a lattice bank is built
 * over the mass range at --match-floor, placed in --bank-noise-curve, else --noise-curve, else
 * ajith2011, from --fmin; with a spin range (scan's --spin-range) over the masses and aligned spins.
 */
export function resolveTemplates(
  flags: SearchFlags,
  massRangeSolar: [number, number] | undefined,
  fMinHz: number,
  fMinTyped: boolean,
  spinRange?: [number, number],
): { templates: SearchTemplate[]; description: string; fMinHz: number } {
  if (flags.bank) {
    const bank = readBankFile(flags.bank);
    if (fMinTyped && fMinHz !== bank.fMinHz) {
      process.stderr.write(`chirpsieve: note: --fmin ${fMinHz} Hz differs from the bank's ${bank.fMinHz} Hz, from which its coverage was verified\n`);
    }
    return { templates: bank.templates, description: flags.bank, fMinHz: fMinTyped ? fMinHz : bank.fMinHz };
  }
  if (!massRangeSolar) throw new UsageError("--mass-range or --bank: one is needed to know which templates to use");
  const matchFloor = parseNumberFlag("--match-floor", flags.matchFloor, { min: 0, max: 1, minExclusive: true, maxExclusive: true });
  const placementCurve = flags.bankNoiseCurve || flags.noiseCurve || "ajith2011";
  const bank = withBankFlagErrors(
    () =>
      spinRange
        ? buildSpinBank({ massRangeSolar, spinRange, matchFloor, fMinHz: fMinHz, psd: psdModelFromSpec(placementCurve) })
        : buildBank({ massRangeSolar, matchFloor, fMinHz: fMinHz, psd: psdModelFromSpec(placementCurve) }),
    "narrow it, raise --fmin or lower --match-floor (or build a bank with `chirpsieve bank` and pass --bank)",
  );
  const spins = spinRange ? `, aligned spins ${spinRange[0]} to ${spinRange[1]}` : "";
  return {
    templates: bank.templates,
    description: `built: ${massRangeSolar.join(":")} M_sun${spins}, minimal match ${matchFloor}, placed in ${placementCurve}`,
    fMinHz,
  };
}
