import { InputError } from "../errors.js";
import { CORRUPT_OVER_MEDIAN, medianMagnitude } from "./corruptSample.js";
import type { SearchInput } from "./types.js";

/** Why a stretch of samples cannot be searched. */
export type BadDataKind = "non-finite" | "constant" | "corrupt";

/** A run of unusable samples [start, end) (sample indices of the input). */
export interface BadStretch {
  readonly start: number;
  readonly end: number;
  readonly kind: BadDataKind;
  /** For "constant": the repeated value (0 for a zero-filled stretch). For "corrupt": the largest magnitude. */
  readonly value: number;
}

/**
 * Identical consecutive samples that make a stretch "constant" (zero-filled, or a frozen
 * digitiser). Detector noise never repeats a value this often: even 16-bit counts with a noise of
 * a few counts repeat 32 times in a row with probability ~1e-22 per sample. Ours; common practice, no source.
 */
export const MIN_CONSTANT_RUN = 32;

/** Samples read per screening step: bounds memory whatever the input's length. */
const SCREEN_CHUNK = 1 << 20;

/**
 * Finds every stretch of an input that no filter can use: non-finite samples (NaN or ±∞, the usual
 * mark of missing data), runs of at least MIN_CONSTANT_RUN identical samples (zero-filled or frozen
 * data), and corrupt samples (magnitude over CORRUPT_OVER_MEDIAN times the median magnitude of
 * their 2^20-sample chunk). Reads the input once, a chunk at a time; returns the stretches in
 * order, neighbouring stretches of one kind merged.
 */
export async function screenInput(input: SearchInput, minConstantRun = MIN_CONSTANT_RUN): Promise<BadStretch[]> {
  const out: BadStretch[] = [];
  const push = (start: number, end: number, kind: BadDataKind, value: number): void => {
    const last = out[out.length - 1];
    if (last && last.kind === kind && last.end >= start && (kind !== "constant" || Object.is(last.value, value))) {
      out[out.length - 1] = { start: last.start, end: Math.max(last.end, end), kind, value: kind === "corrupt" ? Math.max(last.value, value) : value };
    } else {
      out.push({ start, end, kind, value });
    }
  };
  // The current run of identical finite samples, carried across chunks.
  let runStart = 0;
  let runValue = NaN;
  let runLength = 0;
  let nonFiniteStart = -1;
  for (let off = 0; off < input.length; off += SCREEN_CHUNK) {
    const x = await input.read(off, Math.min(SCREEN_CHUNK, input.length - off));
    const limit = CORRUPT_OVER_MEDIAN * medianMagnitude(x);
    for (let i = 0; i < x.length; i++) {
      const v = x[i];
      const at = off + i;
      if (!Number.isFinite(v)) {
        if (nonFiniteStart < 0) nonFiniteStart = at;
        if (runLength >= minConstantRun) push(runStart, at, "constant", runValue);
        runLength = 0;
        runValue = NaN;
        continue;
      }
      if (nonFiniteStart >= 0) {
        push(nonFiniteStart, at, "non-finite", NaN);
        nonFiniteStart = -1;
      }
      if (v === runValue) {
        runLength++;
      } else {
        if (runLength >= minConstantRun) push(runStart, at, "constant", runValue);
        runStart = at;
        runValue = v;
        runLength = 1;
      }
      if (limit > 0 && Math.abs(v) > limit) push(at, at + 1, "corrupt", Math.abs(v));
    }
  }
  if (nonFiniteStart >= 0) push(nonFiniteStart, input.length, "non-finite", NaN);
  if (runLength >= minConstantRun) push(runStart, input.length, "constant", runValue);
  out.sort((a, b) => a.start - b.start);
  return out;
}

/** What is wrong with a bad stretch, in a few words ("non-finite samples", "constant 0 (zero-filled)", …). */
export function describeBadStretch(s: BadStretch): string {
  switch (s.kind) {
    case "non-finite":
      return "non-finite samples (NaN or infinite)";
    case "constant":
      return s.value === 0 ? "zero-filled samples" : `constant samples (${s.value.toExponential(3)})`;
    case "corrupt":
      return `corrupt samples (up to ${s.value.toExponential(2)}, over ${CORRUPT_OVER_MEDIAN.toExponential(0)} times the median magnitude)`;
  }
}

/**
 * The error for an input with bad stretches that were not to be left out: one line naming the input,
 * the first stretch's kind, time and length, and how many more there are. Its parameter is
 * `badData` (the option that would leave them out); `user` says what rejects them.
 */
export function badDataError(input: Pick<SearchInput, "file" | "sampleRate" | "startTime">, bad: readonly BadStretch[], user = "the search"): InputError {
  const fs = input.sampleRate;
  const b = bad[0];
  const t0 = input.startTime + b.start / fs;
  const message =
    `${input.file}: ${describeBadStretch(b)} at t = ${t0.toFixed(4)} s (samples ${b.start}–${b.end - 1}, ${((b.end - b.start) / fs).toPrecision(3)} s)` +
    `${bad.length > 1 ? ` and ${bad.length - 1} more bad stretch(es)` : ""}; bad data are rejected unless ${user} is told to leave them out`;
  return new InputError(message, { parameter: "badData", detail: message });
}
