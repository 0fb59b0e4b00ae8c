import { existsSync } from "node:fs";
import { InputError } from "../errors.js";
import { canonicalHash } from "../run/canonicalJson.js";
import { appendJournalRecord, dropTornTail, readJournalLines, startJournal } from "../run/jsonLinesJournal.js";
import { crashPoint } from "../io/crashPoint.js";
import { MASS_KEY_RENAMES, withCurrentKeys } from "../io/renamedKeys.js";
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

/** SHA-256 (hex) of the JSON of `args` with object keys sorted: equal arguments, equal fingerprint. */
export function campaignFingerprint(args: unknown): string {
  return canonicalHash(args);
}

/** Starts (or restarts) a state file: the header line alone, written atomically. */
export function startCampaignState(path: string, fingerprint: string, args: unknown): void {
  const header: CampaignStateHeader = { type: "campaign-state", format: 2, fingerprint, arguments: args };
  startJournal(path, header);
}

/**
 * Records one finished batch of the campaign `fingerprint`: one JSON line, carrying the campaign's
 * fingerprint, appended with one write and an fsync.
 */
export function appendCampaignBatch(path: string, fingerprint: string, result: BatchResult): void {
  appendJournalRecord(path, { type: "batch", campaign: fingerprint, ...result });
  crashPoint(`campaign-batch-${result.batch}`);
}

/**
 * Reads the finished batches of a state file written for the same fingerprint. A last line cut
 * short by a crash (no newline, or not JSON) is dropped and cut from the file so that appending
 * continues cleanly; a batch recorded twice counts once. Throws InputError when the file is not a
 * state file, was written for different arguments, or holds a batch line of another campaign (two
 * campaigns shared the file). Returns null when the file does not exist. Batches written before the
 * masses carried their unit (primaryMass, chirpMass, recoveredChirpMass, …) are read under the current names.
 */
export function readCampaignState(path: string, fingerprint: string): BatchResult[] | null {
  const read = readJournalLines(path, "start afresh instead of resuming");
  if (!read) {
    if (existsSync(path)) throw new InputError(`${path}: not a campaign state file (no header line)`);
    return null;
  }
  const h = read.header;
  if (h.type === "campaign-state" && h.format === 1) {
    throw new InputError(`${path}: a state file of an older version (its batches carry no campaign identity); start afresh instead of resuming`);
  }
  if (h.type !== "campaign-state" || h.format !== 2 || typeof h.fingerprint !== "string") {
    throw new InputError(`${path}: not a campaign state file (its first line is not a campaign-state header)`);
  }
  if (h.fingerprint !== fingerprint) {
    throw new InputError(
      `${path}: the state was written for different arguments (fingerprint ${h.fingerprint.slice(0, 12)}…, now ${fingerprint.slice(0, 12)}…); ` +
        "rerun with the same arguments, or start afresh instead of resuming",
    );
  }
  const batches = new Map<number, BatchResult>();
  for (const { line, value: rec } of read.records) {
    if (rec.type !== "batch") continue;
    if (rec.campaign !== fingerprint) {
      const other = typeof rec.campaign === "string" ? `${rec.campaign.slice(0, 12)}…` : "none";
      throw new InputError(
        `${path}: line ${line} is a batch of another campaign (fingerprint ${other}, this one ${fingerprint.slice(0, 12)}…): two campaigns shared this state; ` +
          "start afresh instead of resuming, and give each campaign its own state file",
      );
    }
    const { type: _t, campaign: _c, ...result } = rec;
    const r = currentBatchKeys(result);
    if (!batches.has(r.batch)) batches.set(r.batch, r);
  }
  dropTornTail(path, read);
  return [...batches.values()].sort((a, b) => a.batch - b.batch);
}

/** A batch record with its injections' and false candidates' mass keys under their current names. */
function currentBatchKeys(result: Record<string, unknown>): BatchResult {
  const list = (v: unknown): unknown => (Array.isArray(v) ? v.map((x) => withCurrentKeys(x, MASS_KEY_RENAMES)) : v);
  return { ...result, injections: list(result.injections), falseCandidates: list(result.falseCandidates) } as unknown as BatchResult;
}
