import { InputError } from "../errors.js";
import { checkReadRange, shown } from "./strainChecks.js";
import type { StrainSeries, StrainReader } from "./strainTypes.js";

/**
 * A {@link StrainReader} over a series already in memory (e.g. simulated data, or a text file
 * once parsed). `read` returns copies, so callers may modify them. Samples are not checked for
 * finiteness here: the series is taken as given. `sampleRate` and `startTime` are checked.
 */
export function strainReaderFromSeries(series: StrainSeries): StrainReader {
  const { data, sampleRate, startTime, file, label, units } = series;
  if (!(data instanceof Float64Array)) throw new InputError(`${file}: data must be a Float64Array`);
  if (typeof sampleRate !== "number" || !Number.isFinite(sampleRate) || sampleRate <= 0) {
    throw new InputError(`${file}: sampleRate must be a positive number (got ${shown(sampleRate)})`);
  }
  if (typeof startTime !== "number" || !Number.isFinite(startTime)) {
    throw new InputError(`${file}: startTime must be a finite number of seconds (got ${shown(startTime)})`);
  }
  let closed = false;
  const source: StrainReader = {
    file,
    sampleRate,
    startTime,
    length: data.length,
    ...(label !== undefined ? { label } : {}),
    ...(units !== undefined ? { units } : {}),
    ...(series.warnings !== undefined ? { warnings: series.warnings } : {}),
    async read(offset: number, count: number): Promise<Float64Array> {
      checkReadRange(file, offset, count, data.length);
      if (closed) throw new Error(`${file}: read after close`);
      return data.slice(offset, offset + count);
    },
    async close(): Promise<void> {
      closed = true;
    },
  };
  return source;
}
