import { createHash } from "node:crypto";
import { closeSync, existsSync, fsyncSync, openSync, readFileSync, truncateSync, writeSync } from "node:fs";
import { InputError } from "../errors.js";
import { writeFileAtomic } from "../io/atomicWrite.js";
import { crashPoint } from "../io/crashPoint.js";
import type { BatchResult } from "./campaign.js";

/** The first line of a campaign state file. */
export interface CampaignStateHeader {
  type: "campaign-state";
  format: 2;
  /** Hash of the arguments that determine the campaign's results ({@link campaignFingerprint}). */
  fingerprint: string;
  /** The arguments themselves, for a person reading the file. */
  arguments: unknown;
}

function canonical(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(canonical);
  if (value !== null && typeof value === "object") {
    const out: Record<string, unknown> = {};
    for (const k of Object.keys(value as object).sort()) {
      const v = (value as Record<string, unknown>)[k];
      if (v !== undefined) out[k] = canonical(v);
    }
    return out;
  }
  return value;
}

/** SHA-256 (hex) of the JSON of `args` with object keys sorted: equal arguments, equal fingerprint. */
export function campaignFingerprint(args: unknown): string {
  return createHash("sha256").update(JSON.stringify(canonical(args))).digest("hex");
}

/** Appends one complete line with a single write, then fsyncs it, so a crash leaves whole lines only (or a torn last line). */
function appendLine(path: string, line: string): void {
  const fd = openSync(path, "a");
  try {
    writeSync(fd, `${line}\n`);
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
}

/** Starts (or restarts) a state file: the header line alone, written atomically. */
export function startCampaignState(path: string, fingerprint: string, args: unknown): void {
  const header: CampaignStateHeader = { type: "campaign-state", format: 2, fingerprint, arguments: args };
  writeFileAtomic(path, `${JSON.stringify(header)}\n`);
}

/**
 * Records one finished batch of the campaign `fingerprint`: one JSON line, carrying the campaign's
 * fingerprint, appended with one write and an fsync.
 */
export function appendCampaignBatch(path: string, fingerprint: string, result: BatchResult): void {
  appendLine(path, JSON.stringify({ type: "batch", campaign: fingerprint, ...result }));
  crashPoint(`campaign-batch-${result.batch}`);
}

/**
 * Reads the finished batches of a state file written for the same fingerprint. A last line cut
 * short by a crash (no newline, or not JSON) is dropped and cut from the file so that appending
 * continues cleanly; a batch recorded twice counts once. Throws InputError when the file is not a
 * state file, was written for different arguments, or holds a batch line of another campaign (two
 * campaigns shared the file). Returns null when the file does not exist.
 */
export function readCampaignState(path: string, fingerprint: string): BatchResult[] | null {
  if (!existsSync(path)) return null;
  const text = readFileSync(path, "utf8");
  const lines = text.split("\n");
  // Everything after the last newline is a torn write.
  const complete = lines.slice(0, -1);
  let goodBytes = 0;
  let header: CampaignStateHeader | undefined;
  const batches = new Map<number, BatchResult>();
  for (const [i, line] of complete.entries()) {
    let rec: Record<string, unknown>;
    try {
      rec = JSON.parse(line) as Record<string, unknown>;
    } catch {
      if (i === complete.length - 1) break;
      throw new InputError(`${path}: line ${i + 1} is not valid JSON; the state file is damaged (start afresh without --resume)`);
    }
    if (i === 0) {
      if (rec.type === "campaign-state" && rec.format === 1) {
        throw new InputError(`${path}: a state file of an older version (its batches carry no campaign identity); start afresh without --resume`);
      }
      if (rec.type !== "campaign-state" || rec.format !== 2 || typeof rec.fingerprint !== "string") {
        throw new InputError(`${path}: not a campaign state file (its first line is not a campaign-state header)`);
      }
      header = rec as unknown as CampaignStateHeader;
      if (header.fingerprint !== fingerprint) {
        throw new InputError(
          `${path}: the state was written for different arguments (fingerprint ${header.fingerprint.slice(0, 12)}…, now ${fingerprint.slice(0, 12)}…); ` +
            "rerun with the same arguments, or without --resume to start afresh",
        );
      }
    } else if (rec.type === "batch") {
      if (rec.campaign !== fingerprint) {
        const other = typeof rec.campaign === "string" ? `${rec.campaign.slice(0, 12)}…` : "none";
        throw new InputError(
          `${path}: line ${i + 1} is a batch of another campaign (fingerprint ${other}, this one ${fingerprint.slice(0, 12)}…): two campaigns shared this state; ` +
            "start afresh without --resume, and give each campaign its own --state",
        );
      }
      const { type: _t, campaign: _c, ...result } = rec;
      const r = result as unknown as BatchResult;
      if (!batches.has(r.batch)) batches.set(r.batch, r);
    }
    goodBytes += Buffer.byteLength(line, "utf8") + 1;
  }
  if (!header) throw new InputError(`${path}: not a campaign state file (no header line)`);
  if (goodBytes < Buffer.byteLength(text, "utf8")) truncateSync(path, goodBytes);
  return [...batches.values()].sort((a, b) => a.batch - b.batch);
}
