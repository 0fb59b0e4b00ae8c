import { createHash } from "node:crypto";
import { closeSync, openSync, readSync, statSync } from "node:fs";
import { basename, dirname, extname, join } from "node:path";
import { resolveFftBackend } from "../fft/backends.js";
import type { FftBackendName } from "../fft/types.js";
import { planSearch, truncationSeconds, type SearchPlan } from "../search/scan.js";
import { psdLabel } from "../search/psdLabel.js";
import type { TimeInterval } from "../search/streamPlan.js";
import type { SkippedStretch } from "../search/types.js";
import type { GateSettings } from "../noise/gating.js";
import type { ShardSpec, WorkBlock } from "./shardWork.js";
import { canonicalHash } from "./canonicalJson.js";
import type { SearchInput, SearchOptions } from "../search/types.js";

/** One input file of a run as manifests record it. */
export interface RunInput {
  /** The name the candidates carry (the path as given). */
  file: string;
  /** SHA-256 (hex) of the file's bytes, or of its samples as little-endian float64 when there is no file. */
  sha256: string;
  hashOf: "file" | "samples";
  samples: number;
  sampleRate: number;
  startTime: number;
  /** Segments of the run's plan for this input, and their length (samples). */
  segments: number;
  segmentSamples: number;
  /** Stretches the plan leaves out (bad data, excluded intervals), with reasons, and their seconds. */
  skipped: SkippedStretch[];
  skippedSeconds: number;
  /** Seconds of valid data lost to the filter's lead-in and tail at the valid intervals' edges. */
  lostToEdgesSeconds: number;
  /** Seconds at the start and end of the input where no coalescence can be searched (as SearchSummary). */
  leadInSeconds: number;
  tailSeconds: number;
}

/** The search settings that shape the result (recorded in manifests and hashed into the run id). */
export interface SearchDescription {
  templates: number;
  /** SHA-256 of the bank's masses (m1, m2 pairs as little-endian float64). */
  bankSha256: string;
  fMinHz: number;
  fMaxHz: number | null;
  snrThreshold: number;
  chi2Bands: number;
  chi2Allowance: number;
  loudestWithinSeconds: number;
  /** e.g. "ajith2011" or "welch-median-4s" (the CLI's label). */
  psd: string;
  /** The noise curve's values at fixed frequencies (a model), or the estimate's settings. */
  psdFingerprint: unknown;
  truncationSeconds: number;
  segmentSeconds: number | null;
  fftBackend: FftBackendName;
  badData: "reject" | "exclude" | "ignore";
  analysisIntervals: readonly TimeInterval[] | null;
  excludedIntervals: readonly TimeInterval[] | null;
  gating: GateSettings | "default" | null;
  /** Each template filtered at its own output rate (search/outputRate.ts), and that rate's ε (null: the default). */
  perTemplateRate: boolean;
  bandPowerLoss: number | null;
}

/** The JSON file beside a shard's candidate file (see shardRun.ts, mergeShards.ts). */
export interface ShardManifest {
  tool: "chirpsieve";
  format: 1;
  version: string;
  /** Hash of everything that shapes the result, except the shard: equal for every shard of one run. */
  runId: string;
  shard: ShardSpec;
  /** The candidate (segment record) file's name, in the manifest's folder. */
  candidates: string;
  /** Size (bytes) and SHA-256 (hex) of the candidate file as written: a merge reads nothing else. */
  candidatesBytes: number;
  candidatesSha256: string;
  /** Blocks of (input, segments, templates) this shard ran, inclusive ranges. */
  covered: { blocks: WorkBlock[] };
  inputs: RunInput[];
  search: SearchDescription;
  /** The caller's (CLI's) arguments that shape the result, for a person and for the run id. */
  arguments: Record<string, unknown>;
  created: string;
  /** Threads that filtered the bank in this shard (not part of the run id: results do not depend on it). */
  threads?: number;
}

/** SHA-256 (hex) of a file's bytes, read in 4 MiB pieces. */
export function fileSha256(path: string): string {
  const hash = createHash("sha256");
  const buf = Buffer.allocUnsafe(4 << 20);
  const fd = openSync(path, "r");
  try {
    for (;;) {
      const n = readSync(fd, buf, 0, buf.length, null);
      if (n <= 0) break;
      hash.update(buf.subarray(0, n));
    }
  } finally {
    closeSync(fd);
  }
  return hash.digest("hex");
}

async function samplesSha256(source: SearchInput): Promise<string> {
  const hash = createHash("sha256");
  const chunk = 1 << 20;
  for (let off = 0; off < source.length; off += chunk) {
    const x = await source.read(off, Math.min(chunk, source.length - off));
    const f = Float64Array.from(x);
    hash.update(Buffer.from(f.buffer, f.byteOffset, f.byteLength));
  }
  return hash.digest("hex");
}

function isFile(path: string): boolean {
  try {
    return statSync(path).isFile();
  } catch {
    return false;
  }
}

/**
 * Describes the inputs of a run: checksum (of the file at `path`, default `source.file`, or of the
 * samples when there is no such file), size and this run's segment plan for each (`plan` when the
 * caller has made it with planSearch and these options, else planned here).
 */
export async function describeInputs(
  inputs: readonly { source: SearchInput; path?: string; plan?: SearchPlan }[],
  options: SearchOptions,
): Promise<RunInput[]> {
  const out: RunInput[] = [];
  for (const { source, path, plan: given } of inputs) {
    const p = path ?? source.file;
    const byFile = isFile(p);
    const plan = given ?? (await planSearch(source, options));
    out.push({
      file: source.file,
      sha256: byFile ? fileSha256(p) : await samplesSha256(source),
      hashOf: byFile ? "file" : "samples",
      samples: source.length,
      sampleRate: source.sampleRate,
      startTime: source.startTime,
      segments: plan.segments.length,
      segmentSamples: plan.size,
      skipped: plan.excluded.map((r) => ({ startTime: source.startTime + r.start / source.sampleRate, endTime: source.startTime + r.end / source.sampleRate, reason: r.reason })),
      skippedSeconds: plan.excludedSamples / source.sampleRate,
      lostToEdgesSeconds: plan.edgeSamples / source.sampleRate,
      leadInSeconds: plan.invalidStart / source.sampleRate,
      tailSeconds: plan.invalidEnd / source.sampleRate,
    });
  }
  return out;
}

const FINGERPRINT_FREQUENCIES = Array.from({ length: 25 }, (_, i) => 2 ** (i / 2 + 2)); // 4 Hz … 16 kHz

/** The result-shaping search settings, with the FFT backend resolved ("auto" → what runs). */
export function describeSearch(options: SearchOptions): SearchDescription {
  const masses = new Float64Array(2 * options.templates.length);
  options.templates.forEach((t, i) => {
    masses[2 * i] = t.primaryMassSolar;
    masses[2 * i + 1] = t.secondaryMassSolar;
  });
  // Spinning banks also hash their spins (a non-spinning bank's hash is that of its masses alone).
  const spinning = options.templates.some((t) => (t.primarySpin ?? 0) !== 0 || (t.secondarySpin ?? 0) !== 0);
  const spins = new Float64Array(spinning ? 2 * options.templates.length : 0);
  if (spinning) options.templates.forEach((t, i) => spins.set([t.primarySpin ?? 0, t.secondarySpin ?? 0], 2 * i));
  const psd = options.psd;
  return {
    templates: options.templates.length,
    bankSha256: createHash("sha256").update(Buffer.from(masses.buffer)).update(Buffer.from(spins.buffer)).digest("hex"),
    fMinHz: options.fMinHz,
    fMaxHz: options.fMaxHz ?? null,
    snrThreshold: options.snrThreshold,
    chi2Bands: options.chi2Bands,
    chi2Allowance: options.chi2Allowance ?? 0,
    loudestWithinSeconds: options.loudestWithinSeconds,
    psd: psdLabel(psd),
    psdFingerprint:
      psd.kind === "model"
        ? { name: psd.model.name, fMinHz: psd.model.fMinHz, values: FINGERPRINT_FREQUENCIES.map((f) => { const v = psd.model.evaluate(f); return Number.isFinite(v) ? v : String(v); }) }
        : { segmentSeconds: psd.segmentSeconds, average: psd.average },
    truncationSeconds: truncationSeconds(options),
    segmentSeconds: options.segmentSeconds ?? null,
    fftBackend: resolveFftBackend(options.fftBackend ?? "auto"),
    badData: options.badData ?? "reject",
    analysisIntervals: options.analysisIntervals ?? null,
    excludedIntervals: options.excludedIntervals ?? null,
    gating: options.gating === undefined ? "default" : options.gating,
    perTemplateRate: options.perTemplateRate !== false,
    bandPowerLoss: options.bandPowerLoss ?? null,
  };
}

/** The run id: SHA-256 of the tool version, the search settings, the inputs and the caller's arguments (never the shard). */
export function scanRunId(version: string, search: SearchDescription, inputs: readonly RunInput[], args: Record<string, unknown>): string {
  return canonicalHash({ tool: "chirpsieve", version, search, inputs, arguments: args });
}

/** `part-3.jsonl` → `part-3.manifest.json` (beside it). */
export function manifestPathFor(candidatesPath: string): string {
  const ext = extname(candidatesPath);
  const stem = ext ? basename(candidatesPath, ext) : basename(candidatesPath);
  return join(dirname(candidatesPath), `${stem}.manifest.json`);
}

/** The resume journal kept beside an output file: `out.jsonl` → `out.jsonl.journal`. */
export function journalPathFor(outPath: string): string {
  return `${outPath}.journal`;
}
