import { InputError } from "../errors.js";
import type { TimeInterval } from "../search/streamPlan.js";
import { readTextInput } from "./readTextInput.js";

/**
 * Parses a list of time intervals: one `start end` pair per line (seconds, the strain's own time
 * base, separated by spaces, tabs or a comma), `#` starting a comment, blank lines ignored. Each
 * interval must have finite start < end. Overlapping or touching intervals are merged; the result
 * is sorted. `name` labels messages ("FILE:LINE: …").
 *
 * ```
 * # synthetic example: two stretches of a night's run
 * 1000 1600
 * 2000.5 2900   # after the calibration change
 * ```
 */
export function parseIntervals(text: string, name: string): TimeInterval[] {
  const out: TimeInterval[] = [];
  const lines = text.split(/\r?\n/);
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i].replace(/#.*/, "").trim();
    if (line === "") continue;
    const fields = line.split(/[\s,]+/);
    const where = `${name}:${i + 1}`;
    if (fields.length !== 2) throw new InputError(`${where}: expected "start end" (two numbers of seconds), got "${line}"`);
    const [start, end] = fields.map(Number);
    if (!Number.isFinite(start) || !Number.isFinite(end)) throw new InputError(`${where}: "${line}" is not two numbers of seconds`);
    if (!(end > start)) throw new InputError(`${where}: the end ${end} must be after the start ${start}`);
    out.push({ start, end });
  }
  out.sort((a, b) => a.start - b.start);
  const merged: TimeInterval[] = [];
  for (const iv of out) {
    const last = merged[merged.length - 1];
    if (last && iv.start <= last.end) merged[merged.length - 1] = { start: last.start, end: Math.max(last.end, iv.end) };
    else merged.push(iv);
  }
  return merged;
}

/** Reads an interval file (see {@link parseIntervals}); an empty list is an InputError. */
export function readIntervalFile(path: string): TimeInterval[] {
  const list = parseIntervals(readTextInput(path, "interval file"), path);
  if (list.length === 0) throw new InputError(`${path}: no intervals (expected lines of "start end" in seconds)`);
  return list;
}
