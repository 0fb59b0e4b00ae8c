import { createHash } from "node:crypto";
import { closeSync, existsSync, fstatSync, lstatSync, openSync, readdirSync, readSync, statSync } from "node:fs";
import { basename, dirname, join, resolve } from "node:path";
import { InputError } from "../errors.js";
import { mergeSegmentRecords, type MergedScan } from "./mergeSegments.js";
import { canonicalJson } from "./canonicalJson.js";
import { manifestPathFor, type ShardManifest } from "./shardManifest.js";
import { type SegmentRecord, segmentRecordWithCurrentKeys } from "./shardRecord.js";
import { coveredSegments, shardLabel, shardWork } from "./shardWork.js";

/** One shard found for a merge: its manifest and its candidate (segment record) file. */
export interface ShardFiles {
  manifestPath: string;
  candidatesPath: string;
  manifest: ShardManifest;
}

/** The merged result of a complete set of shards of one run. */
export interface MergedShards extends MergedScan {
  runId: string;
  /** The shard count N of the run. */
  shards: number;
  by: ShardManifest["shard"]["by"];
  /** Shared description of the run (from the first manifest; every shard's has the same run id). */
  version: string;
  search: ShardManifest["search"];
  inputs: ShardManifest["inputs"];
  arguments: Record<string, unknown>;
  /** The most threads any shard filtered with (1 when the manifests do not say). */
  threads: number;
}

const MANIFEST_SUFFIX = ".manifest.json";

/**
 * Expands merge arguments into manifest paths: a folder gives every `*.manifest.json` in it; a
 * manifest is taken as is; any other file (a shard's candidate file) gives the manifest beside it.
 * The same file named twice counts once.
 */
export function findShardManifests(paths: readonly string[]): string[] {
  if (paths.length === 0) throw new InputError("merge: give a folder of shard outputs or the shard files");
  const out: string[] = [];
  const seen = new Set<string>();
  const add = (p: string): void => {
    const r = resolve(p);
    if (!seen.has(r)) {
      seen.add(r);
      out.push(p);
    }
  };
  for (const p of paths) {
    let isDir = false;
    try {
      isDir = statSync(p).isDirectory();
    } catch {
      throw new InputError(`merge: ${p}: no such file or folder`);
    }
    if (isDir) {
      const found = readdirSync(p)
        .filter((f) => f.endsWith(MANIFEST_SUFFIX))
        .sort();
      if (found.length === 0) throw new InputError(`merge: ${p}: no shard manifests (*${MANIFEST_SUFFIX}) in this folder`);
      for (const f of found) add(join(p, f));
    } else if (p.endsWith(MANIFEST_SUFFIX)) {
      add(p);
    } else {
      const m = manifestPathFor(p);
      if (!existsSync(m)) throw new InputError(`merge: ${p}: no manifest ${basename(m)} beside it (was the shard finished?)`);
      add(m);
    }
  }
  return out;
}

/** Largest manifest read (bytes): a manifest lists a few blocks and the inputs, far below this. */
const MAX_MANIFEST_BYTES = 16 << 20;
/** Largest shard record file read (bytes): survivors and deciding peaks of its segments, far below this. */
const MAX_RECORD_BYTES = 1 << 30;

/**
 * Reads a regular file of at most `maxBytes` (checked on the open file, so a device or a file
 * swapped in between is never read unbounded). Returns the bytes.
 */
function readBoundedFile(path: string, maxBytes: number, what: string): Buffer {
  let fd = -1;
  try {
    fd = openSync(path, "r");
    const st = fstatSync(fd);
    if (!st.isFile()) throw new InputError(`merge: ${path}: not a regular file (${what})`);
    if (st.size > maxBytes) throw new InputError(`merge: ${path}: ${st.size} bytes, more than the ${maxBytes} expected of ${what}`);
    const buf = Buffer.alloc(st.size);
    let got = 0;
    while (got < buf.length) {
      const n = readSync(fd, buf, got, buf.length - got, got);
      if (n <= 0) break;
      got += n;
    }
    if (got !== st.size) throw new InputError(`merge: ${path}: changed while being read`);
    return buf;
  } catch (err) {
    if (err instanceof InputError) throw err;
    throw new InputError(`merge: ${path}: cannot read ${what} (${(err as Error).message.split("\n")[0]})`);
  } finally {
    if (fd >= 0) closeSync(fd);
  }
}

function readManifest(path: string): ShardManifest {
  let m: ShardManifest;
  const bytes = readBoundedFile(path, MAX_MANIFEST_BYTES, "a shard manifest");
  try {
    m = JSON.parse(bytes.toString("utf8")) as ShardManifest;
  } catch (error) {
    throw new InputError(`merge: ${path}: not a readable JSON manifest (${(error as Error).message.split("\n")[0]})`);
  }
  const ok =
    m !== null &&
    typeof m === "object" &&
    m.tool === "chirpsieve" &&
    m.format === 1 &&
    typeof m.runId === "string" &&
    m.shard !== null &&
    typeof m.shard === "object" &&
    Number.isInteger(m.shard.index) &&
    Number.isInteger(m.shard.count) &&
    typeof m.candidates === "string" &&
    Array.isArray(m.inputs) &&
    m.search !== null &&
    typeof m.search === "object" &&
    Array.isArray(m.covered?.blocks);
  if (!ok) throw new InputError(`merge: ${path}: not a chirpsieve shard manifest`);
  // The record file must be a plain name in the manifest's own folder: no path, no way out of it.
  if (m.candidates === "" || m.candidates === "." || m.candidates === ".." || /[\\/\0]/.test(m.candidates)) {
    throw new InputError(`merge: ${path}: candidates ${JSON.stringify(m.candidates)} is not a file name in the manifest's folder`);
  }
  if (!Number.isSafeInteger(m.candidatesBytes) || m.candidatesBytes < 0 || typeof m.candidatesSha256 !== "string" || !/^[0-9a-f]{64}$/.test(m.candidatesSha256)) {
    throw new InputError(`merge: ${path}: records no size and SHA-256 of its candidate file (written by an older version?); rerun shard ${m.shard.index}/${m.shard.count}`);
  }
  if (m.candidatesBytes > MAX_RECORD_BYTES) {
    throw new InputError(`merge: ${path}: records a candidate file of ${m.candidatesBytes} bytes, more than the ${MAX_RECORD_BYTES} a shard's records can take; split the run into more shards`);
  }
  return m;
}

/**
 * Reads and checks the manifests of a set of shards: one run (equal run ids, shard counts and
 * splits), every shard 0..N−1 present exactly once, and each shard's recorded coverage equal to
 * what that shard of this run must cover. Errors are InputErrors like
 * `merge: shard 2/4 is missing` or `merge: shard 1/4 appears twice (a.jsonl, b.jsonl)`.
 */
export function readShardSet(paths: readonly string[]): ShardFiles[] {
  const files: ShardFiles[] = findShardManifests(paths).map((manifestPath) => {
    const manifest = readManifest(manifestPath);
    return { manifestPath, manifest, candidatesPath: join(dirname(manifestPath), manifest.candidates) };
  });
  const first = files[0];
  const name = (f: ShardFiles): string => basename(f.candidatesPath);
  for (const f of files) {
    if (f.manifest.runId !== first.manifest.runId) {
      throw new InputError(
        `merge: ${name(first)} and ${name(f)} belong to different runs (run ids ${first.manifest.runId.slice(0, 12)}… and ${f.manifest.runId.slice(0, 12)}…): ` +
          "every shard must be scanned with the same arguments, inputs and version",
      );
    }
    if (f.manifest.shard.count !== first.manifest.shard.count) {
      throw new InputError(`merge: ${name(first)} is shard ${shardLabel(first.manifest.shard)} but ${name(f)} is shard ${shardLabel(f.manifest.shard)}: the shard counts differ`);
    }
    if (f.manifest.shard.by !== first.manifest.shard.by) {
      throw new InputError(`merge: ${name(first)} was split by ${first.manifest.shard.by} but ${name(f)} by ${f.manifest.shard.by}`);
    }
  }
  const count = first.manifest.shard.count;
  const byIndex = new Map<number, ShardFiles>();
  for (const f of files) {
    const i = f.manifest.shard.index;
    if (!(i >= 0 && i < count)) throw new InputError(`merge: ${f.manifestPath}: shard index ${i} is outside 0..${count - 1}`);
    const other = byIndex.get(i);
    if (other) throw new InputError(`merge: shard ${shardLabel(f.manifest.shard)} appears twice (${name(other)}, ${name(f)})`);
    byIndex.set(i, f);
  }
  const missing: string[] = [];
  for (let i = 0; i < count; i++) if (!byIndex.has(i)) missing.push(`${i}/${count}`);
  if (missing.length === 1) throw new InputError(`merge: shard ${missing[0]} is missing`);
  if (missing.length > 1) {
    const shown = missing.length > 8 ? `${missing.slice(0, 8).join(", ")}, … (${missing.length} in all)` : missing.join(", ");
    throw new InputError(`merge: shards ${shown} are missing`);
  }
  const ordered = [...byIndex.entries()].sort((a, b) => a[0] - b[0]).map(([, f]) => f);
  // Each shard must cover exactly what that shard of this run covers: then together they cover
  // every (segment, template) once, because shardWork is a partition.
  const segmentCounts = first.manifest.inputs.map((i) => i.segments);
  for (const f of ordered) {
    const want = shardWork(segmentCounts, first.manifest.search.templates, f.manifest.shard).blocks;
    if (canonicalJson(want) !== canonicalJson(f.manifest.covered.blocks)) {
      throw new InputError(`merge: ${f.manifestPath}: the coverage it records is not that of shard ${shardLabel(f.manifest.shard)} of this run`);
    }
  }
  return ordered;
}

/** Reads one shard's record file and checks it is complete and matches its manifest. */
export function readShardRecords(f: ShardFiles): SegmentRecord[] {
  if (!existsSync(f.candidatesPath)) {
    throw new InputError(`merge: ${f.candidatesPath}: no such file (the candidates of shard ${shardLabel(f.manifest.shard)})`);
  }
  const label = shardLabel(f.manifest.shard);
  const where = `merge: ${f.candidatesPath}`;
  if (lstatSync(f.candidatesPath).isSymbolicLink()) throw new InputError(`${where}: a symbolic link; a shard's candidate file must be a regular file in the shard folder`);
  const size = statSync(f.candidatesPath).size;
  if (size !== f.manifest.candidatesBytes) {
    throw new InputError(`${where}: ${size} bytes, but its manifest records ${f.manifest.candidatesBytes}: the file changed or was cut short; rerun shard ${label}`);
  }
  const bytes = readBoundedFile(f.candidatesPath, f.manifest.candidatesBytes, `the candidates of shard ${label}`);
  if (createHash("sha256").update(bytes).digest("hex") !== f.manifest.candidatesSha256) {
    throw new InputError(`${where}: its SHA-256 differs from the one its manifest records: the file changed; rerun shard ${label}`);
  }
  const lines = bytes.toString("utf8").split("\n").filter((l) => l.trim() !== "");
  const parsed = lines.map((l, i) => {
    try {
      return JSON.parse(l) as Record<string, unknown>;
    } catch {
      throw new InputError(`${where}: line ${i + 1} is not valid JSON; rerun shard ${label}`);
    }
  });
  const head = parsed[0];
  if (!head || head.type !== "shard" || head.runId !== f.manifest.runId) {
    throw new InputError(`${where}: not the record file of shard ${label} of run ${f.manifest.runId.slice(0, 12)}… (its header differs)`);
  }
  const end = parsed[parsed.length - 1];
  if (!end || end.type !== "end") throw new InputError(`${where}: incomplete (no end line); rerun shard ${label}`);
  const records = parsed.slice(1, -1).map(segmentRecordWithCurrentKeys);
  const covered = coveredSegments({ shard: f.manifest.shard, blocks: f.manifest.covered.blocks });
  if (records.length !== covered.length || end.segments !== covered.length) {
    throw new InputError(`${where}: holds ${records.length} segment records but shard ${label} covers ${covered.length}; rerun it`);
  }
  for (const [k, c] of covered.entries()) {
    const r = records[k];
    if (r.type !== "segment" || r.input !== c.input || r.segment !== c.segment || r.templates?.[0] !== c.templates[0] || r.templates?.[1] !== c.templates[1]) {
      throw new InputError(`${where}: record ${k + 1} is not segment ${c.segment} of input ${c.input} with templates ${c.templates.join("..")}; rerun shard ${label}`);
    }
  }
  return records;
}

/**
 * Merges a complete set of shards (folders, manifests or candidate files) into the result an
 * unsharded run gives: same candidates, same numbers (see mergeSegmentRecords).
 */
export function mergeShards(paths: readonly string[]): MergedShards {
  const files = readShardSet(paths);
  const first = files[0].manifest;
  const records: SegmentRecord[] = [];
  for (const f of files) for (const r of readShardRecords(f)) records.push(r);
  const merged = mergeSegmentRecords(
    {
      inputs: first.inputs.map((i) => ({ file: i.file, segments: i.segments, sampleRate: i.sampleRate, skipped: i.skipped, skippedSeconds: i.skippedSeconds })),
      templateCount: first.search.templates,
      loudestWithinSeconds: first.search.loudestWithinSeconds,
    },
    records,
  );
  return {
    ...merged,
    runId: first.runId,
    shards: first.shard.count,
    by: first.shard.by,
    version: first.version,
    search: first.search,
    inputs: first.inputs,
    arguments: first.arguments ?? {},
    threads: Math.max(1, ...files.map((f) => (typeof f.manifest.threads === "number" ? f.manifest.threads : 1))),
  };
}
