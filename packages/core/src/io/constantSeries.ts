import { InputError } from "../errors.js";
import type { StrainReader } from "./strainTypes.js";

/** Samples per read while looking for a second value (bounds memory on long files). */
const CHUNK = 1 << 20;

/** What {@link findConstantSeries} found: every finite sample of the file equals `value`. */
export interface ConstantSeries {
  file: string;
  /** The one value every finite sample has (NaN when no sample is finite). */
  value: number;
}

/**
 * Looks for a second distinct finite value in a source and returns undefined as soon as it finds
 * one (for recorded strain, at the second sample); when every finite sample has the same value
 * (all zeros, a constant offset, or no finite sample at all) it returns that value. Non-finite
 * samples are passed over, so a source opened with `nonFinite: "allow"` can be checked too.
 * Such a file has no strain to search: its PSD is zero and its SNRs are meaningless.
 */
export async function findConstantSeries(source: StrainReader): Promise<ConstantSeries | undefined> {
  let first = Number.NaN;
  for (let at = 0; at < source.length; at += CHUNK) {
    const chunk = await source.read(at, Math.min(CHUNK, source.length - at));
    const n = chunk.length;
    for (let i = 0; i < n; i++) {
      const x = chunk[i];
      if (x - x !== 0) continue;
      if (first !== first) first = x;
      else if (x !== first) return undefined;
    }
  }
  return { file: source.file, value: first };
}

/** One line saying why a constant file cannot be searched, naming it. */
export function describeConstantSeries(c: ConstantSeries): string {
  if (Number.isNaN(c.value)) return `${c.file}: no sample is finite; there is no strain to search`;
  if (c.value === 0) return `${c.file}: every sample is zero; there is no strain to search`;
  return `${c.file}: every sample is ${c.value} (a constant series); there is no strain to search`;
}

/** Throws an InputError naming the file when every finite sample of `source` has one value. */
export async function checkNotConstant(source: StrainReader): Promise<void> {
  const c = await findConstantSeries(source);
  if (c) throw new InputError(describeConstantSeries(c));
}
