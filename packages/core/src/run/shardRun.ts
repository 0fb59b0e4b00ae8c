import { createHash } from "node:crypto";
import { mkdirSync } from "node:fs";
import { basename, dirname } from "node:path";
import { InputError } from "../errors.js";
import { writeFileAtomic } from "../io/atomicWrite.js";
import { openScanJournal, type ScanJournal } from "./scanJournal.js";
import { mergeSegmentRecords, type MergedScan, type RunLayout } from "./mergeSegments.js";
import type { SegmentHook } from "../search/segmentHook.js";
import { planSearch, type SearchPlan } from "../search/scan.js";
import {
  describeInputs,
  describeSearch,
  manifestPathFor,
  scanRunId,
  type RunInput,
  type SearchDescription,
  type ShardManifest,
} from "./shardManifest.js";
import { segmentRecord, type SegmentRecord } from "./shardRecord.js";
import { checkShardSpec, coveredSegments, shardLabel, shardWork, templatesOf, type ShardSpec, type ShardWork } from "./shardWork.js";
import type { SearchInput, SearchOptions } from "../search/types.js";

/** What a sharded and/or resumable scan needs to know before it starts. */
export interface ScanRunSetup {
  /** The tool version (recorded, and part of the run id). */
  version: string;
  /** The run's inputs, in order; each is checksummed from the file `file` names (or its samples). */
  inputs: readonly SearchInput[];
  /** The options searchStrain gets (callbacks and `segmentHook` are ignored here). */
  options: SearchOptions;
  /** The caller's arguments that shape the result (not the shard, output or resume flags); hashed into the run id. */
  arguments?: Record<string, unknown>;
  /** Run only this shard of the work; default the whole run. */
  shard?: ShardSpec;
  /** Keep (and resume from) a journal here; default no journal. */
  journalPath?: string;
}

/** A scan run in progress: give `hook(i)` to searchStrain for input i, then take the result or write the shard. */
export interface ScanRun {
  readonly runId: string;
  readonly inputs: readonly RunInput[];
  readonly search: SearchDescription;
  readonly work: ShardWork;
  /** Segments (of all inputs) whose records came from the journal. */
  readonly resumedSegments: number;
  /** The hook to pass as `segmentHook` to searchStrain for input `input`. */
  hook(input: number): SegmentHook;
  /** Records of the segments finished so far (resumed ones first), in no particular order. */
  records(): SegmentRecord[];
  /** The whole run's result (not for a shard of several): what an uninterrupted unsharded searchStrain returns, input by input. */
  result(): MergedScan;
  /** Writes the shard's record file and then its manifest (both atomically); returns the manifest. */
  writeShard(candidatesPath: string, threads?: number): { manifestPath: string; manifest: ShardManifest };
  /** Deletes the journal (call after the output is safely written). */
  finish(): void;
  /** Closes the journal and keeps it (a failed or interrupted run). */
  close(): void;
}

const key = (input: number, segment: number): string => `${input}:${segment}`;

/**
 * Starts a scan run: checksums the inputs, plans their segments as searchStrain will, derives the
 * run id and this shard's work, and opens (or resumes) the journal. Records are kept in memory
 * (they hold only the per-segment survivors and, when the bank is split, a few deciding peaks per
 * loudest-within span) and appended to the journal as each segment finishes.
 */
export async function startScanRun(setup: ScanRunSetup): Promise<ScanRun> {
  if (setup.inputs.length === 0) throw new InputError("scan run: no input files");
  const shard: ShardSpec = setup.shard ?? { index: 0, count: 1, by: "time" };
  checkShardSpec(shard);
  const options = setup.options;
  // Each input is screened and planned once: the plans are handed to searchStrain through the hooks.
  const plans: SearchPlan[] = [];
  for (const source of setup.inputs) plans.push(await planSearch(source, options));
  const inputs = await describeInputs(
    setup.inputs.map((source, i) => ({ source, plan: plans[i] })),
    options,
  );
  const search = describeSearch(options);
  const args = setup.arguments ?? {};
  const runId = scanRunId(setup.version, search, inputs, args);
  const T = options.templates.length;
  const W = options.loudestWithinSeconds;
  const work = shardWork(
    inputs.map((i) => i.segments),
    T,
    shard,
  );
  const covered = coveredSegments(work);
  const expected = new Map(covered.map((c) => [key(c.input, c.segment), c.templates]));
  if (setup.journalPath) mkdirSync(dirname(setup.journalPath), { recursive: true });
  const journal: ScanJournal | undefined = setup.journalPath
    ? openScanJournal(setup.journalPath, { version: setup.version, runId, shard: setup.shard ?? null })
    : undefined;
  const records = new Map<string, SegmentRecord>();
  for (const r of journal?.resumed ?? []) {
    const want = expected.get(key(r.input, r.segment));
    if (!want || want[0] !== r.templates[0] || want[1] !== r.templates[1]) {
      journal?.close();
      throw new InputError(`${setup.journalPath}: the journal records segment ${r.segment} of input ${r.input}, which this run does not cover as recorded; delete it to start afresh`);
    }
    records.set(key(r.input, r.segment), r);
  }
  const resumedSegments = records.size;
  const layout: RunLayout = {
    inputs: inputs.map((i) => ({ file: i.file, segments: i.segments, sampleRate: i.sampleRate, skipped: i.skipped, skippedSeconds: i.skippedSeconds })),
    templateCount: T,
    loudestWithinSeconds: W,
  };

  return {
    runId,
    inputs,
    search,
    work,
    resumedSegments,
    hook(input) {
      if (!(input >= 0 && input < inputs.length)) throw new Error(`scan run: no input ${input}`);
      return {
        plan: plans[input],
        segments(total) {
          if (total !== inputs[input].segments) {
            throw new Error(`scan run: ${inputs[input].file} has ${total} segments in the search but ${inputs[input].segments} in the run plan (different options?)`);
          }
          return covered.filter((c) => c.input === input && !records.has(key(input, c.segment))).map((c) => c.segment);
        },
        templates(segment) {
          const t = templatesOf(work, input, segment);
          if (!t) throw new Error(`scan run: segment ${segment} of ${inputs[input].file} is not in ${shardLabel(shard)}`);
          return { from: t[0], to: t[1] + 1 };
        },
        done(segment, outcome) {
          const t = templatesOf(work, input, segment)!;
          const rec = segmentRecord(input, segment, t, T, W, outcome);
          journal?.append(rec);
          records.set(key(input, segment), rec);
        },
      };
    },
    records: () => [...records.values()],
    result() {
      if (shard.count > 1) throw new Error("scan run: a shard has no result of its own; merge the shards");
      return mergeSegmentRecords(layout, records.values());
    },
    writeShard(candidatesPath, threads) {
      const missing = covered.filter((c) => !records.has(key(c.input, c.segment)));
      if (missing.length > 0) {
        throw new Error(`scan run: ${missing.length} covered segment(s) have no record yet (first: segment ${missing[0].segment} of input ${missing[0].input})`);
      }
      mkdirSync(dirname(candidatesPath), { recursive: true });
      const lines = [JSON.stringify({ type: "shard", tool: "chirpsieve", runId, shard })];
      for (const c of covered) lines.push(JSON.stringify(records.get(key(c.input, c.segment))));
      lines.push(JSON.stringify({ type: "end", segments: covered.length }));
      const text = Buffer.from(lines.join("\n") + "\n", "utf8");
      writeFileAtomic(candidatesPath, text);
      const manifest: ShardManifest = {
        tool: "chirpsieve",
        format: 1,
        version: setup.version,
        runId,
        shard,
        candidates: basename(candidatesPath),
        candidatesBytes: text.length,
        candidatesSha256: createHash("sha256").update(text).digest("hex"),
        covered: { blocks: work.blocks.map((b) => ({ input: b.input, segments: [...b.segments] as [number, number], templates: [...b.templates] as [number, number] })) },
        inputs,
        search,
        arguments: args,
        created: new Date().toISOString(),
        ...(threads !== undefined ? { threads } : {}),
      };
      const manifestPath = manifestPathFor(candidatesPath);
      writeFileAtomic(manifestPath, JSON.stringify(manifest, null, 2) + "\n");
      return { manifestPath, manifest };
    },
    finish() {
      journal?.remove();
    },
    close() {
      journal?.close();
    },
  };
}
