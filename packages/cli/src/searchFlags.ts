// The search options `scan` and `recover` share: one definition, one parser, one bank choice, so
// an injection campaign runs exactly the search a scan runs.
import type { Command } from "commander";
import {
  buildBank,
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
  bankNoiseCurve: string;
  noiseCurve?: string;
  fmin: string;
  minSnr: string;
  chi2Bands: string;
  chi2Allowance: string;
  clusterWindow: string;
  psdSegment: string;
  psdAverage: string;
  segment?: string;
  fft: string;
  threads?: string;
}

/** Adds the shared search flags to a command (`--fmin` default differs between commands). */
export function addSearchOptions(cmd: Command, defaults: { fmin: string }): Command {
  return cmd
    .option("--bank <file>", "template bank file written by `chirpsieve bank`")
    .option("--match-floor <mm>", "minimal match of a bank built on the fly over --mass-range", "0.97")
    .option("--bank-noise-curve <name|file>", "noise curve used to place a bank built on the fly (default: --noise-curve, else ajith2011)", "")
    .option("--fmin <Hz>", "low-frequency cutoff of templates and filter (Hz)", defaults.fmin)
    .option("--min-snr <rho>", "report peaks with SNR at or above this", "6")
    .option("--chi2-bands <p>", "frequency bands of the chi-squared discriminator (0 = off)", "16")
    .option(
      "--chi2-allowance <delta>",
      "chi-squared a signal may carry from imperfect template match, as a fraction of SNR²: the reweighted SNR divides chi-squared by dof + delta·SNR² (0 = off; ~0.03 lets signals of another waveform model keep their SNR; larger values weaken glitch rejection)",
      "0",
    )
    .option("--cluster-window <s>", "keep the loudest peak within ± this many seconds", "1")
    .option("--psd-segment <s>", "Welch segment length for the PSD estimate (s)", "4")
    .option("--psd-average <kind>", "Welch average: median or mean", "median")
    .option("--fft <backend>", "FFT backend: auto, pffft or fftjs", "auto")
    .option("--threads <n>", "worker threads filtering the bank (default: the number of cores; small jobs use 1)");
}

/** The shared flags, parsed and checked; every error names its flag. */
export interface ParsedSearchFlags {
  fMinHz: number;
  snrThreshold: number;
  chi2Bins: number;
  chi2Allowance: number;
  clusterWindowSeconds: number;
  psdSegmentSeconds: number;
  psdAverage: "median" | "mean";
  segmentSeconds: number | undefined;
  fftChoice: FftBackendChoice;
  threads: number | undefined;
}

export function parseSearchFlags(flags: SearchFlags): ParsedSearchFlags {
  const chi2Bins = parseNumberFlag("--chi2-bands", flags.chi2Bands, { min: 0, integer: true });
  if (chi2Bins === 1) throw new UsageError("--chi2-bands: must be 0 (off) or at least 2 (got 1)");
  return {
    fMinHz: parseNumberFlag("--fmin", flags.fmin, { min: 0, minExclusive: true }),
    snrThreshold: parseNumberFlag("--min-snr", flags.minSnr, { min: 0, minExclusive: true }),
    chi2Bins,
    chi2Allowance: parseNumberFlag("--chi2-allowance", flags.chi2Allowance, { min: 0 }),
    clusterWindowSeconds: parseNumberFlag("--cluster-window", flags.clusterWindow, { min: 0, minExclusive: true }),
    psdSegmentSeconds: parseNumberFlag("--psd-segment", flags.psdSegment, { min: 0, minExclusive: true }),
    psdAverage: parseChoiceFlag("--psd-average", flags.psdAverage, ["median", "mean"] as const),
    segmentSeconds: flags.segment === undefined ? undefined : parseNumberFlag("--segment", flags.segment, { min: 0, minExclusive: true }),
    fftChoice: parseChoiceFlag("--fft", flags.fft, ["auto", "pffft", "fftjs"] as const),
    threads: flags.threads === undefined ? undefined : capThreads(parseNumberFlag("--threads", flags.threads, { min: 1, integer: true })),
  };
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
 * ajith2011, from --fmin.
 */
export function resolveTemplates(
  flags: SearchFlags,
  massRangeSolar: [number, number] | undefined,
  fMinHz: number,
  fMinTyped: boolean,
): { templates: SearchTemplate[]; description: string; fMinHz: number } {
  if (flags.bank) {
    const bank = readBankFile(flags.bank);
    if (fMinTyped && fMinHz !== bank.fminHz) {
      process.stderr.write(`chirpsieve: note: --fmin ${fMinHz} Hz differs from the bank's ${bank.fminHz} Hz, from which its coverage was verified\n`);
    }
    return { templates: bank.templates, description: flags.bank, fMinHz: fMinTyped ? fMinHz : bank.fminHz };
  }
  if (!massRangeSolar) throw new UsageError("--mass-range or --bank: one is needed to know which templates to use");
  const matchFloor = parseNumberFlag("--match-floor", flags.matchFloor, { min: 0, max: 1, minExclusive: true, maxExclusive: true });
  const placementCurve = flags.bankNoiseCurve || flags.noiseCurve || "ajith2011";
  const bank = withBankFlagErrors(
    () => buildBank({ massRangeSolar, matchFloor, fminHz: fMinHz, psd: psdModelFromSpec(placementCurve) }),
    "narrow it, raise --fmin or lower --match-floor (or build a bank with `chirpsieve bank` and pass --bank)",
  );
  return {
    templates: bank.templates,
    description: `built: ${massRangeSolar.join(":")} M_sun, minimal match ${matchFloor}, placed in ${placementCurve}`,
    fMinHz,
  };
}
