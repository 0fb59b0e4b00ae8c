import { InputError } from "../errors.js";
import type { SearchInput } from "./types.js";

/** Wraps an in-memory series as a SearchInput (for library use and tests). */
export function arrayInput(data: Float64Array, sampleRate: number, startTime = 0, file = "<memory>"): SearchInput {
  if (!(sampleRate > 0) || !Number.isFinite(sampleRate)) throw new InputError(`${file}: sampleRate must be a positive number (got ${sampleRate})`);
  if (data.length === 0) throw new InputError(`${file}: the series is empty`);
  return {
    file,
    sampleRate,
    startTime,
    length: data.length,
    read: async (offset, count) => data.slice(offset, offset + count),
  };
}
