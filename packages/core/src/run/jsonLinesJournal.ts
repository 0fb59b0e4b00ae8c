import { closeSync, existsSync, fsyncSync, openSync, readFileSync, truncateSync, writeSync } from "node:fs";
import { dirname } from "node:path";
import { InputError } from "../errors.js";
import { writeFileAtomic } from "../io/atomicWrite.js";

/**
 * A resumable record of finished work: a header line, then one JSON record per line, each
 * appended with one write and an fsync, so a kill leaves whole lines and at most a torn last one.
 * Used by scan journals (scanJournal.ts) and injection-campaign state (inject/campaignState.ts).
 */
export interface JournalLines {
  /** The header (first line), parsed. */
  header: Record<string, unknown>;
  /** The complete record lines after the header, parsed, with their 1-based line numbers. */
  records: { line: number; value: Record<string, unknown> }[];
  /** Bytes of the complete part (header and records, each with its newline). */
  goodBytes: number;
  totalBytes: number;
}

/**
 * Reads a journal: everything after the last newline is a torn write and is ignored, as is a last
 * complete line that is not JSON; an earlier line that is not JSON is damage, an InputError that
 * ends with `remedy`. Returns null when the file is missing or holds no complete first line.
 */
export function readJournalLines(path: string, remedy: string): JournalLines | null {
  if (!existsSync(path)) return null;
  const text = readFileSync(path, "utf8");
  const lines = text.split("\n").slice(0, -1);
  let header: Record<string, unknown> | undefined;
  const records: JournalLines["records"] = [];
  let goodBytes = 0;
  for (const [i, line] of lines.entries()) {
    let value: Record<string, unknown>;
    try {
      value = JSON.parse(line) as Record<string, unknown>;
    } catch {
      if (i === lines.length - 1) break;
      throw new InputError(`${path}: line ${i + 1} is not valid JSON; the file is damaged (${remedy})`);
    }
    if (i === 0) header = value;
    else records.push({ line: i + 1, value });
    goodBytes += Buffer.byteLength(line, "utf8") + 1;
  }
  if (!header) return null;
  return { header, records, goodBytes, totalBytes: Buffer.byteLength(text, "utf8") };
}

/** Cuts a torn last line off a journal that {@link readJournalLines} read, so appending continues cleanly. */
export function dropTornTail(path: string, read: JournalLines): void {
  if (read.goodBytes < read.totalBytes) truncateSync(path, read.goodBytes);
}

/** Starts a journal: its header line alone, written atomically, and the directory synced. */
export function startJournal(path: string, header: unknown): void {
  writeFileAtomic(path, `${JSON.stringify(header)}\n`);
  syncDirectory(path);
}

/** Appends one record as one line with one write, then fsyncs it. `fd` is open for appending. */
export function appendJournalLine(fd: number, record: unknown): void {
  const bytes = Buffer.from(`${JSON.stringify(record)}\n`, "utf8");
  let off = 0;
  while (off < bytes.length) off += writeSync(fd, bytes, off, bytes.length - off);
  fsyncSync(fd);
}

/** Opens a journal for appending, appends one record, closes it. */
export function appendJournalRecord(path: string, record: unknown): void {
  const fd = openSync(path, "a");
  try {
    appendJournalLine(fd, record);
  } finally {
    closeSync(fd);
  }
}

function syncDirectory(path: string): void {
  let fd = -1;
  try {
    fd = openSync(dirname(path), "r");
    fsyncSync(fd);
  } catch {
    // Not every file system lets a directory be opened or synced; the rename is still atomic.
  } finally {
    if (fd >= 0) closeSync(fd);
  }
}
