import { InputError } from "../errors.js";
import { createNoiseStream } from "../noise/colouredNoise.js";
import type { PsdInput } from "../noise/interpolatePsd.js";
import type { Detector } from "../waveform/antenna.js";
import { taylorT4Duration } from "../waveform/taylorT4Evolution.js";
import { type Injection, type StrainSegment, addSegment, projectInjection } from "./injection.js";

/** Options for {@link synthesizeStrain}. */
export interface StrainSynthesisOptions {
  /** Noise PSD (ignored when `noise` is false). */
  psd: PsdInput;
  sampleRate: number;
  /** Time (s) of the first sample, file time base. */
  startTime: number;
  /** Length of the series, s; duration × sampleRate must be a whole number of samples. */
  duration: number;
  /** Seed of the noise stream. */
  seed: string | number;
  /** GW frequency (Hz) where injected chirps start. */
  fMinHz: number;
  injections: Injection[];
  detector: Detector;
  /** Add coloured Gaussian noise (default true); false gives the injected signals alone. */
  noise?: boolean;
  /** Samples per chunk handed out (default 262144). */
  chunkSamples?: number;
}

/** Number of samples of a series of `duration` seconds at `sampleRate`; throws unless it is whole. */
export function seriesLength(duration: number, sampleRate: number): number {
  if (!(sampleRate > 0) || !Number.isFinite(sampleRate)) throw new InputError(`sampleRate must be a positive number (got ${sampleRate})`);
  if (!(duration > 0) || !Number.isFinite(duration)) throw new InputError(`duration must be a positive number of seconds (got ${duration})`);
  const n = Math.round(duration * sampleRate);
  if (Math.abs(n - duration * sampleRate) > 1e-6 * Math.max(1, n)) {
    throw new InputError(`duration × sampleRate must be a whole number of samples (got ${duration} s × ${sampleRate} Hz)`);
  }
  return n;
}

/**
 * Simulated detector strain, produced in consecutive chunks so that long series need not be held in
 * memory: seeded stationary coloured Gaussian noise (createNoiseStream) plus the projected TaylorT4
 * signals of the injections (projectInjection). Each injection's waveform is generated when the
 * chunks first reach it and dropped once they have passed it. Concatenating the chunks gives the
 * same series whatever `chunkSamples` is.
 */
export function* synthesizeStrain(options: StrainSynthesisOptions): Generator<Float64Array, void, undefined> {
  const o = options;
  const fs = o.sampleRate;
  const total = seriesLength(o.duration, fs);
  if (!Number.isFinite(o.startTime)) throw new InputError(`startTime must be a finite number (got ${o.startTime})`);
  const chunk = o.chunkSamples ?? 262_144;
  if (!Number.isInteger(chunk) || chunk < 1) throw new InputError(`chunkSamples must be a positive integer (got ${chunk})`);
  const stream = o.noise === false ? undefined : createNoiseStream({ psd: o.psd, sampleRate: fs, seed: o.seed });

  // Rough span of each projected chirp in samples (generous: 1 s either side) to know when to build it.
  const spans = o.injections.map((inj) => {
    const tc = (inj.coalescenceTime - o.startTime) * fs;
    const d = taylorT4Duration(inj.primaryMassSolar, inj.secondaryMassSolar, o.fMinHz) * fs;
    return { first: Math.floor(tc - d - fs), last: Math.ceil(tc + fs) };
  });
  const built = new Map<number, StrainSegment>();

  for (let pos = 0; pos < total; pos += chunk) {
    const count = Math.min(chunk, total - pos);
    const out = stream ? stream.next(count) : new Float64Array(count);
    for (let k = 0; k < spans.length; k++) {
      const { first, last } = spans[k];
      if (last < pos || first >= pos + count) {
        if (last < pos) built.delete(k);
        continue;
      }
      let seg = built.get(k);
      if (!seg) {
        seg = projectInjection(o.injections[k], o.detector, { sampleRate: fs, gridStartTime: o.startTime, fMinHz: o.fMinHz });
        built.set(k, seg);
      }
      addSegment(out, pos, seg);
    }
    yield out;
  }
}
