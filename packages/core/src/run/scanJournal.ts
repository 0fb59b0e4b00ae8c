import { closeSync, openSync, rmSync, truncateSync } from "node:fs";
import { InputError } from "../errors.js";
import { appendJournalLine, readJournalLines, startJournal } from "./jsonLinesJournal.js";
import { type SegmentRecord, segmentRecordWithCurrentKeys } from "./shardRecord.js";
import type { ShardSpec } from "./shardWork.js";

/** First line of a scan journal. */
export interface JournalHeader {
  type: "scan-journal";
  tool: "chirpsieve";
  format: 1;
  version: string;
  /** The run this journal belongs to (see scanRunId). */
  runId: string;
  /** The shard the journal belongs to, or null for a whole run. */
  shard: ShardSpec | null;
}

/** An open scan journal: a header line, then one segment record per line, appended as segments finish. */
export interface ScanJournal {
  readonly path: string;
  /** Records already in the journal when it was opened (a resumed run's finished segments). */
  readonly resumed: readonly SegmentRecord[];
  /** Appends one record: one line, one write, then fsync, so a kill leaves whole lines and at most a torn last one. */
  append(record: SegmentRecord): void;
  close(): void;
  /** Closes and deletes the journal (once the run's output is safely written). */
  remove(): void;
}

function sameShard(a: ShardSpec | null, b: ShardSpec | null): boolean {
  if (a === null || b === null) return a === b;
  return a.index === b.index && a.count === b.count && a.by === b.by;
}

/**
 * Reads a journal's header and complete records (jsonLinesJournal.ts: a torn last line is
 * ignored); a record repeated keeps its first copy. Returns null when the file is missing or holds
 * no complete header. `goodBytes` is the length of the complete part.
 */
export function readScanJournal(path: string): { header: JournalHeader; records: SegmentRecord[]; goodBytes: number; totalBytes: number } | null {
  const read = readJournalLines(path, "delete it to start afresh");
  if (!read) return null;
  const h = read.header;
  if (h.type !== "scan-journal" || h.format !== 1 || typeof h.runId !== "string") {
    throw new InputError(`${path}: not a chirpsieve scan journal (its first line is not a journal header)`);
  }
  const records: SegmentRecord[] = [];
  const seen = new Set<string>();
  for (const { value } of read.records) {
    if (value.type !== "segment") continue;
    const r = segmentRecordWithCurrentKeys(value);
    const key = `${r.input}:${r.segment}`;
    if (!seen.has(key)) {
      seen.add(key);
      records.push(r);
    }
  }
  return { header: h as unknown as JournalHeader, records, goodBytes: read.goodBytes, totalBytes: read.totalBytes };
}

/**
 * Opens the journal at `path` for the run `header.runId` (and shard): continues an existing journal
 * of the same run and shard (cutting off a torn last line), or starts a new one (header written
 * atomically). A journal of another run or shard is refused with an InputError, never overwritten.
 */
export function openScanJournal(path: string, header: Omit<JournalHeader, "type" | "tool" | "format">): ScanJournal {
  const full: JournalHeader = { type: "scan-journal", tool: "chirpsieve", format: 1, version: header.version, runId: header.runId, shard: header.shard };
  const found = readScanJournal(path);
  let resumed: SegmentRecord[] = [];
  if (found) {
    if (found.header.runId !== full.runId) {
      throw new InputError(
        `${path}: the journal belongs to another run (run id ${found.header.runId.slice(0, 12)}…, this run ${full.runId.slice(0, 12)}…); ` +
          "rerun with the same arguments and inputs, or delete the journal to start afresh",
      );
    }
    if (!sameShard(found.header.shard, full.shard)) {
      const show = (s: ShardSpec | null): string => (s ? `shard ${s.index}/${s.count} by ${s.by}` : "the whole run");
      throw new InputError(`${path}: the journal belongs to ${show(found.header.shard)}, not ${show(full.shard)}; rerun the same shard, or delete it`);
    }
    if (found.goodBytes < found.totalBytes) truncateSync(path, found.goodBytes);
    resumed = found.records;
  } else {
    startJournal(path, full);
  }
  let fd = openSync(path, "a");
  const close = (): void => {
    if (fd >= 0) closeSync(fd);
    fd = -1;
  };
  return {
    path,
    resumed,
    append(record) {
      if (fd < 0) throw new Error(`${path}: the journal is closed`);
      appendJournalLine(fd, record);
    },
    close,
    remove() {
      close();
      rmSync(path, { force: true });
    },
  };
}
