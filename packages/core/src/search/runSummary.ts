// The summary record of a scan, one shape whether the run was whole, resumed or merged from shards.
import type { FftBackendName } from "../fft/types.js";
import type { SearchSummary } from "./types.js";

/**
 * What one input of a run covered: a SearchSummary's figures (for shards, recovered from their
 * records and manifests; `threads` there is the most any shard used), the per-stretch ones optional.
 */
export type InputCoverage = Pick<
  SearchSummary,
  "file" | "segments" | "segmentSamples" | "sampleRate" | "analysedSeconds" | "dataSeconds" | "leadInSeconds" | "tailSeconds" | "skippedSeconds" | "skipped" | "threads"
> &
  Partial<Pick<SearchSummary, "lostToEdgesSeconds" | "intervals" | "gates" | "unsearchable">>;

/** The run-wide settings and results a summary reports besides its inputs. */
export interface RunSummaryParts {
  inputs: readonly InputCoverage[];
  templates: number;
  /** How the bank came about (a file name, or how it was built). */
  bank: string;
  candidates: number;
  minSnr: number;
  chi2Allowance: number;
  fMinHz: number;
  /** The PSD label, e.g. "ajith2011" or "welch-median-4s". */
  psd: string;
  fftBackend: FftBackendName;
  wallSeconds: number;
  /** The caution that a candidate is not a detection. */
  caution: string;
}

/**
 * The `{"type": "summary", ...}` record that ends a scan's output: sums over the inputs (segments,
 * analysed, data, skipped and lost seconds), the largest lead-in and tail, every gate, one entry
 * per input (stream) under `streams`, the settings, and `extra`
 * fields (e.g. a merge's shard count and run id) before the wall time and the caution.
 */
export function runSummaryRecord(parts: RunSummaryParts, extra: Record<string, unknown> = {}): Record<string, unknown> {
  const inputs = parts.inputs;
  const sum = (f: (i: InputCoverage) => number): number => inputs.reduce((a, i) => a + f(i), 0);
  const uniform = <T>(values: T[]): T | null => (values.length > 0 && values.every((v) => v === values[0]) ? values[0] : null);
  return {
    type: "summary",
    files: inputs.length,
    templates: parts.templates,
    bank: parts.bank,
    segments: sum((i) => i.segments),
    // One value when every input (stream) shares it, else null (each one's is under `streams`).
    segmentSamples: uniform(inputs.map((i) => i.segmentSamples)),
    sampleRate: uniform(inputs.map((i) => i.sampleRate)),
    analysedSeconds: sum((i) => i.analysedSeconds),
    dataSeconds: sum((i) => i.dataSeconds),
    leadInSeconds: Math.max(0, ...inputs.map((i) => i.leadInSeconds)),
    tailSeconds: Math.max(0, ...inputs.map((i) => i.tailSeconds)),
    skippedSeconds: sum((i) => i.skippedSeconds),
    skipped: inputs.flatMap((i) => i.skipped.map((k) => ({ file: i.file, ...k }))),
    lostToEdgesSeconds: sum((i) => i.lostToEdgesSeconds ?? 0),
    gates: inputs.flatMap((i) => (i.gates ?? []).map((g) => ({ file: i.file, ...g }))),
    streams: inputs.map((i) => ({
      file: i.file,
      sampleRate: i.sampleRate,
      segments: i.segments,
      segmentSamples: i.segmentSamples,
      dataSeconds: i.dataSeconds,
      analysedSeconds: i.analysedSeconds,
      skippedSeconds: i.skippedSeconds,
      lostToEdgesSeconds: i.lostToEdgesSeconds ?? 0,
      intervals: i.intervals ?? 1,
      gates: (i.gates ?? []).length,
      ...(i.unsearchable ? { unsearchable: i.unsearchable } : {}),
    })),
    candidates: parts.candidates,
    minSnr: parts.minSnr,
    chi2Allowance: parts.chi2Allowance,
    fMinHz: parts.fMinHz,
    psd: parts.psd,
    fftBackend: parts.fftBackend,
    threads: Math.max(1, ...inputs.map((i) => i.threads)),
    ...extra,
    wallSeconds: parts.wallSeconds,
    caution: parts.caution,
  };
}
