import { existsSync, readdirSync, readFileSync, renameSync, rmSync } from "node:fs";
import { basename, dirname, join, resolve } from "node:path";
import { InputError } from "../errors.js";
import { partialPathFor, syncDirectory, writeFileAtomic } from "./atomicWrite.js";
import { crashPoint } from "./crashPoint.js";
import { outputTarget } from "./fileIdentity.js";

/** The commit record of a set being renamed into place: every member's staged and final path. */
interface CommitRecord {
  type: "chirpsieve-file-set";
  format: 1;
  members: { staged: string; final: string }[];
}

const COMMIT_SUFFIX = ".set-commit.json";

/** The commit record of the set named after `setPath`: `.NAME.set-commit.json` beside it. */
export function commitRecordPath(setPath: string): string {
  return join(dirname(setPath), `.${basename(setPath)}${COMMIT_SUFFIX}`);
}

function readCommitRecord(path: string): CommitRecord | undefined {
  let rec: CommitRecord;
  try {
    rec = JSON.parse(readFileSync(path, "utf8")) as CommitRecord;
  } catch {
    return undefined;
  }
  if (rec?.type !== "chirpsieve-file-set" || !Array.isArray(rec.members)) return undefined;
  return rec;
}

/** Completes the renames a commit record lists (those not done yet) and removes the record. */
function rollForward(recordPath: string, rec: CommitRecord): void {
  const dirs = new Set<string>();
  for (const m of rec.members) {
    if (existsSync(m.staged)) renameSync(m.staged, m.final);
    dirs.add(dirname(m.final));
  }
  for (const d of dirs) syncDirectory(d);
  rmSync(recordPath, { force: true });
  syncDirectory(dirname(recordPath));
}

/**
 * Finishes every interrupted set write that concerns one of `paths`: a commit record in a path's
 * directory naming it as a member means the whole new set was written and flushed before the kill,
 * so its remaining renames are done now. Returns the commit records completed. A record that cannot
 * be completed (no permission) is an InputError naming the file.
 */
export function completePendingFileSets(paths: readonly string[]): string[] {
  const wanted = new Set(paths.map((p) => resolve(p)));
  const done: string[] = [];
  for (const dir of new Set(paths.map((p) => dirname(resolve(p))))) {
    let names: string[];
    try {
      names = readdirSync(dir);
    } catch {
      continue;
    }
    for (const name of names) {
      if (!name.startsWith(".") || !name.endsWith(COMMIT_SUFFIX)) continue;
      const recordPath = join(dir, name);
      const rec = readCommitRecord(recordPath);
      if (!rec || !rec.members.some((m) => wanted.has(resolve(m.final)))) continue;
      try {
        rollForward(recordPath, rec);
      } catch (err) {
        const member = rec.members.find((m) => wanted.has(resolve(m.final)))!.final;
        throw new InputError(`${member}: an interrupted write of its file set could not be completed (${(err as Error).message.split("\n")[0]}); rerun the command that wrote it`);
      }
      done.push(recordPath);
    }
  }
  return done;
}

/**
 * Writes several files as one set, so that a reader sees either the whole old set or the whole new
 * one, even if the process is killed at any point:
 *   1. `stage(staged)` writes each member to the temporary name `staged(final)` gives (hidden,
 *      beside the final file) and flushes it;
 *   2. a commit record listing every (temporary, final) pair is written atomically beside `setPath`;
 *   3. the temporary files are renamed over the finals, then the record is removed.
 * A kill before step 2 leaves the old set and stale temporary files (removed by the next write);
 * a kill after it leaves the record, and the next write or any chirpsieve reader of a member
 * completes the renames first ({@link completePendingFileSets}). Symbolic links among the finals
 * are written through. Returns the final paths written.
 */
export async function writeFileSet(
  setPath: string,
  stage: (staged: (finalPath: string) => string) => Promise<void> | void,
): Promise<string[]> {
  const recordPath = commitRecordPath(setPath);
  const previous = readCommitRecord(recordPath);
  if (previous) rollForward(recordPath, previous);
  const members: { staged: string; final: string }[] = [];
  const staged = (finalPath: string): string => {
    const final = resolve(outputTarget(finalPath));
    const existing = members.find((m) => m.final === final);
    if (existing) return existing.staged;
    const m = { staged: partialPathFor(final), final };
    members.push(m);
    return m.staged;
  };
  try {
    await stage(staged);
  } catch (err) {
    for (const m of members) rmSync(m.staged, { force: true });
    throw err;
  }
  crashPoint("set-staged");
  const record: CommitRecord = { type: "chirpsieve-file-set", format: 1, members };
  writeFileAtomic(recordPath, `${JSON.stringify(record)}\n`);
  syncDirectory(dirname(recordPath));
  crashPoint("set-committed");
  members.forEach((m, i) => {
    renameSync(m.staged, m.final);
    crashPoint(`set-renamed-${i + 1}`);
  });
  for (const d of new Set(members.map((m) => dirname(m.final)))) syncDirectory(d);
  rmSync(recordPath, { force: true });
  syncDirectory(dirname(recordPath));
  return members.map((m) => m.final);
}
