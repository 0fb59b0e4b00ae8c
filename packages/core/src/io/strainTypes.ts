/** The strain file formats chirpsieve reads and writes. */
export type StrainFormat = "f32" | "f64" | "text" | "hdf5";

/**
 * A uniformly sampled strain series held in memory. Sample i is at time
 * `startTime + i / sampleRate` seconds, in the file's own time base.
 */
export interface StrainSeries {
  data: Float64Array;
  /** Samples per second (Hz). */
  sampleRate: number;
  /** Time of sample 0 (s). */
  startTime: number;
  /** The file it came from (as the caller named it), for messages. */
  file: string;
  label?: string;
  /** The strain's units as the file states them (see {@link isDimensionlessStrain}). */
  units?: string;
  /** Non-fatal remarks about the file (e.g. an unknown sidecar key), one line each naming the file. */
  warnings?: string[];
}

/** How to open a strain file. Every field is optional. */
export interface StrainOpenOptions {
  /** Default: from the extension (.f32, .f64, .txt/.dat/.csv, .h5/.hdf5/.hdf). */
  format?: StrainFormat;
  /**
   * Sample rate (Hz): required for a one-column text file; supplies what an HDF5 file lacks.
   * Where the file also states a rate, the two must agree (else InputError).
   */
  rate?: number;
  /**
   * Start time (s): for a one-column text file (default 0); supplies what an HDF5 file lacks.
   * Where the file also states a start, the two must agree (else InputError).
   */
  start?: number;
  /** HDF5 dataset path (default: the file's only 1-D floating-point dataset). */
  dataset?: string;
  /**
   * HDF5 attribute holding the sample rate or the sample spacing. Names meaning a spacing in
   * seconds (dt, spacing, delta, deltaT, delta_t, Xspacing) are read as seconds, names meaning a rate
   * (sampleRate, sample_rate, samplingRate, sampling_rate, rate, fs) as Hz; for any other
   * name a value below 1 is a spacing in seconds and a value of 1 or more is a rate in Hz.
   */
  rateAttribute?: string;
  /** HDF5 attribute holding the start time in seconds (default: startTime, start_time, start, t0, Xstart). */
  startAttribute?: string;
  /** Default "error": a NaN/±Infinity sample is an InputError naming the file and the sample. */
  nonFinite?: "error" | "allow";
}

/**
 * Chunked access to a strain file: scanning does not need the whole file in memory.
 * `read` returns a new array of samples [offset, offset + count), checked for non-finite values
 * unless the file was opened with `nonFinite: "allow"` (each read checks only what it returns).
 * A range outside [0, length] is a RangeError (a bug in the caller, not a user mistake).
 */
export interface StrainReader {
  readonly file: string;
  /** Samples per second (Hz). */
  readonly sampleRate: number;
  /** Time of sample 0 (s). */
  readonly startTime: number;
  /** Number of samples. */
  readonly length: number;
  readonly label?: string;
  /** The strain's units as the file states them (see {@link isDimensionlessStrain}). */
  readonly units?: string;
  /** Non-fatal remarks about the file (e.g. an unknown sidecar key), one line each naming the file. */
  readonly warnings?: readonly string[];
  /** The run that wrote the file, when its sidecar records one (raw files written by this tool). */
  readonly run?: StrainRun;
  read(offset: number, count: number): Promise<Float64Array>;
  close(): Promise<void>;
}

/** What {@link writeStrain} writes: sample i at `startTime + i / sampleRate` seconds. */
export interface StrainWriteInput {
  data: ArrayLike<number>;
  sampleRate: number;
  startTime: number;
  label?: string;
  units?: string;
  /** Recorded in a raw file's sidecar: the run that wrote it (and its sibling files). */
  run?: StrainRun;
}

/**
 * The run that wrote a strain file: an id equal for equal settings, and the names of the sites
 * whose files that run wrote together (one file per site).
 */
export interface StrainRun {
  id: string;
  sites: string[];
}

/** How to write a strain file. */
export interface StrainWriteOptions {
  /** Default: from the extension. */
  format?: StrainFormat;
  /** HDF5 dataset path (default "strain"); ignored by the other formats. */
  dataset?: string;
  /** Byte order of raw .f32/.f64 samples (default "little"; stated in the sidecar); ignored by the other formats. */
  byteOrder?: "little" | "big";
  /** Default "error": refuse to write NaN/±Infinity samples (the reader would reject them). */
  nonFinite?: "error" | "allow";
  /** Where a raw file's sidecar goes (default `<path>.json`); for writers staging a set of files. */
  sidecarPath?: string;
}
