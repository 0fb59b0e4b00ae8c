import type { Command } from "commander";
import { mergeShards, readShardSet, runSummaryRecord, writeFileAtomic, type Candidate } from "@chirpsieve/core";
import { CANDIDATE_CAUTION, chooseCandidateFormat, renderCandidates } from "../candidateFormat.js";
import { checkFilePlan } from "../outputPath.js";

interface MergeFlags {
  out?: string;
  format?: string;
  json?: boolean;
  quiet?: boolean;
}

/** Registers `chirpsieve merge <dir|files...>`: puts the shards of a `scan --shard` run back together. */
export function registerMerge(program: Command): void {
  program
    .command("merge")
    .description(
      "Merge the shards of a `chirpsieve scan --shard I/N` run into the result one unsharded scan gives: checks that " +
        "they belong to one run and cover it exactly once, then clusters across shard boundaries. " +
        "Reported peaks are candidates, not detections.",
    )
    .argument("<dir-or-files...>", "a folder of shard outputs, or the shards' .jsonl (or .manifest.json) files")
    .option("--out <file>", "write the merged candidates to this file (format from --format or the extension: .jsonl, .csv, .txt)")
    .option("--format <fmt>", "table, jsonl or csv (default: table on a terminal, jsonl otherwise)")
    .option("--json", "same as --format jsonl to stdout")
    .option("--quiet", "no message on stderr")
    .action(async (paths: string[], flags: MergeFlags) => {
      runMerge(paths, flags);
    });
}


function runMerge(paths: string[], flags: MergeFlags): void {
  const wallStart = performance.now();
  const format = chooseCandidateFormat(flags);
  if (flags.out) {
    // Every shard's manifest and record file is an input: --out must be none of them.
    const inputs = readShardSet(paths).flatMap((f) => [
      { flag: "shard manifest", path: f.manifestPath },
      { flag: "shard record file", path: f.candidatesPath },
    ]);
    checkFilePlan({ inputs, outputs: [{ flag: "--out", path: flags.out }] });
  }
  const m = mergeShards(paths);
  const candidates: Candidate[] = m.candidates;
  const summary = runSummaryRecord(
    {
      inputs: m.inputs.map((input, i) => {
        const covered = m.perInput[i];
        return {
          file: input.file,
          segments: covered?.segments ?? input.segments,
          segmentSamples: input.segmentSamples,
          sampleRate: input.sampleRate,
          analysedSeconds: covered?.analysedSeconds ?? 0,
          dataSeconds: input.samples / input.sampleRate,
          leadInSeconds: input.leadInSeconds,
          tailSeconds: input.tailSeconds,
          skippedSeconds: covered?.skippedSeconds ?? 0,
          skipped: covered?.skipped ?? [],
          lostToEdgesSeconds: input.lostToEdgesSeconds,
          gates: covered?.gates ?? [],
          threads: m.threads,
        };
      }),
      templates: m.search.templates,
      bank: typeof m.arguments.bank === "string" ? m.arguments.bank : `${m.search.templates} templates (sha256 ${m.search.bankSha256.slice(0, 12)}…)`,
      candidates: candidates.length,
      minSnr: m.search.snrThreshold,
      chi2Allowance: m.search.chi2Allowance,
      fMinHz: m.search.fMinHz,
      psd: m.search.psd,
      fftBackend: m.search.fftBackend,
      wallSeconds: (performance.now() - wallStart) / 1000,
      caution: CANDIDATE_CAUTION,
    },
    { shards: m.shards, shardBy: m.by, runId: m.runId },
  );
  const text = renderCandidates(format, candidates, summary);
  if (flags.out) writeFileAtomic(flags.out, text);
  else process.stdout.write(text);
  if (flags.out && !flags.quiet) {
    process.stderr.write(`chirpsieve: ${m.shards} shards merged: ${candidates.length} candidate(s) written to ${flags.out}\n`);
  }
}
