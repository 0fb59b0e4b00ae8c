import { InputError } from "../errors.js";
import { createRealFft } from "../fft/create.js";
import { createGaussianDeviates } from "./gaussianDeviates.js";
import { asPsdModel, type PsdInput } from "./interpolatePsd.js";
import { createRealInverseFft } from "./realInverseFft.js";

export interface NoiseStreamOptions {
  /** Target one-sided PSD: a model (analytic fit, table) or a sampled estimate. */
  psd: PsdInput;
  /** Samples per second (Hz). */
  sampleRate: number;
  /** Seed of the Gaussian stream (seedrandom); the same seed gives the same samples. */
  seed: string | number;
  /**
   * Below this frequency (Hz) the PSD is held at its value here (default: the model's fMinHz,
   * or the filter's first frequency bin if that is higher).
   */
  fMinHz?: number;
  /**
   * Length of the colouring filter in seconds (rounded up to a power of two of samples, at least
   * 64 samples; default 8 s). Its frequency resolution 1/filterSeconds is the finest PSD detail
   * reproduced.
   */
  filterSeconds?: number;
}

/** A seeded source of stationary coloured Gaussian noise that can be read in chunks. */
export interface NoiseStream {
  readonly sampleRate: number;
  /** Samples handed out so far. */
  readonly position: number;
  /** Length of the colouring filter in samples. */
  readonly filterLength: number;
  /** The next `count` samples (chunks concatenate to exactly the series one call would give). */
  next(count: number): Float64Array;
}

/**
 * The PSD used for generation at frequency f: the target S(f) for fLow ≤ f ≤ fHigh, held at
 * S(fLow) below fLow (so the steep low-frequency walls of the fits do not put astronomically large
 * power into the lowest bins) and at S(fHigh) above fHigh, where fHigh is the target's fMaxHz if it
 * has one (a table or sampled estimate), else unbounded.
 */
function heldPsd(evaluate: (f: number) => number, fLow: number, fHigh: number): (f: number) => number {
  const sLow = evaluate(fLow);
  const sHigh = fHigh < Infinity ? evaluate(fHigh) : NaN;
  return (f: number) => (f < fLow ? sLow : f > fHigh ? sHigh : evaluate(f));
}

/**
 * Seeded coloured Gaussian noise by filtering white noise with a finite (FIR) filter whose
 * amplitude response is √(S(f)·fs/2), applied by overlap-save FFT convolution.
 *
 * Normalisation (derived here; the convention is the one-sided S with
 * σ² = ∫_0^{fs/2} S df): white noise of unit variance at rate fs has one-sided PSD 2/fs; a filter
 * with frequency response H(f) multiplies a PSD by |H(f)|², so |H(f)|² = S(f)·fs/2 gives output
 * PSD S(f). Equivalently, in terms of an N-point DFT of the output, E|X[k]|² = N·fs·S(f_k)/2, i.e.
 * complex bins with real and imaginary parts of variance N·fs·S/4 — the frequency-domain recipe.
 *
 * Filter design (frequency sampling with a window; common practice, e.g. Oppenheim & Schafer,
 * Discrete-Time Signal Processing, 3rd ed. (2010), Sec. 7.5): on the grid of the filter length L,
 * H[k] = √(S(k·fs/L)·fs/2) (zero phase), inverse FFT, circular shift by L/2 and multiply by a Hann
 * window, so the realised |H|² is S smoothed over ≈ 2 bins of fs/L. The output is stationary from
 * its first sample (the filter's memory is filled with the same white stream), and because the
 * white stream is one fixed sequence per seed, chunks of any size concatenate to the same series.
 * Memory and time per chunk are O(L) per L samples, so hours of data can be produced in pieces.
 */
export function createNoiseStream(options: NoiseStreamOptions): NoiseStream {
  const { sampleRate, seed } = options;
  if (!(sampleRate > 0) || !Number.isFinite(sampleRate)) {
    throw new InputError(`noise: sampleRate must be a positive number of Hz (got ${sampleRate})`);
  }
  if (typeof seed !== "string" && !(typeof seed === "number" && Number.isFinite(seed))) {
    throw new InputError(`noise: seed must be a string or a finite number (got ${String(seed)})`);
  }
  const filterSeconds = options.filterSeconds ?? 8;
  if (!(filterSeconds > 0) || !Number.isFinite(filterSeconds)) {
    throw new InputError(`noise: filterSeconds must be a positive number (got ${filterSeconds})`);
  }
  if (options.fMinHz !== undefined && !(options.fMinHz >= 0 && options.fMinHz < sampleRate / 2)) {
    throw new InputError(`noise: fMinHz must be in [0, ${sampleRate / 2}) Hz (got ${options.fMinHz})`);
  }
  const model = asPsdModel(options.psd);
  let lf = 64;
  while (lf < filterSeconds * sampleRate) lf *= 2;
  const dfFilter = sampleRate / lf;
  const fLow = Math.max(options.fMinHz ?? model.fMinHz, dfFilter);
  const fHigh = model.fMaxHz ?? Infinity;
  if (fHigh < fLow) throw new InputError(`noise: the PSD "${model.name}" ends at ${fHigh} Hz, below its lowest usable frequency ${fLow} Hz`);
  const s = heldPsd((f) => model.evaluate(f), fLow, fHigh);

  // Zero-phase amplitude response on the filter grid, then the windowed, delayed impulse response.
  const amp = new Float64Array(lf + 2);
  for (let k = 0; k <= lf / 2; k++) {
    const v = s(k * dfFilter);
    if (!(v >= 0) || !Number.isFinite(v)) {
      throw new InputError(`noise: the PSD "${model.name}" is not a finite non-negative number at ${k * dfFilter} Hz (got ${v})`);
    }
    amp[2 * k] = Math.sqrt((v * sampleRate) / 2);
  }
  const h0 = new Float64Array(lf);
  createRealInverseFft(lf).inverse(amp, h0);
  const nb = 2 * lf; // block FFT size: lf samples of filter memory + lf new samples
  const h = new Float64Array(nb);
  for (let n = 0; n < lf; n++) {
    const w = 0.5 - 0.5 * Math.cos((2 * Math.PI * n) / lf);
    h[n] = (h0[(n + lf / 2) % lf] / lf) * w;
  }
  const fwd = createRealFft(nb);
  const inv = createRealInverseFft(nb);
  const hSpec = new Float64Array(nb + 2);
  fwd.forward(h, hSpec);

  const gauss = createGaussianDeviates(seed);
  const white = new Float64Array(nb);
  gauss.fill(white.subarray(0, lf)); // filter memory: the stream is stationary from sample 0
  const spec = new Float64Array(nb + 2);
  const conv = new Float64Array(nb);
  const block = new Float64Array(lf);
  let blockPos = lf; // nothing buffered yet
  let position = 0;

  function nextBlock(): void {
    gauss.fill(white.subarray(lf, nb));
    fwd.forward(white, spec);
    for (let k = 0; k <= nb / 2; k++) {
      const ar = spec[2 * k], ai = spec[2 * k + 1];
      const br = hSpec[2 * k], bi = hSpec[2 * k + 1];
      spec[2 * k] = ar * br - ai * bi;
      spec[2 * k + 1] = ar * bi + ai * br;
    }
    inv.inverse(spec, conv);
    // Overlap-save: outputs lf…nb−1 are free of circular wrap (the filter has lf taps, h[0] = 0).
    for (let i = 0; i < lf; i++) block[i] = conv[lf + i] / nb;
    white.copyWithin(0, lf, nb);
    blockPos = 0;
  }

  return {
    sampleRate,
    filterLength: lf,
    get position() {
      return position;
    },
    next(count: number): Float64Array {
      if (!Number.isInteger(count) || count < 0) throw new InputError(`noise: sample count must be a non-negative integer (got ${count})`);
      const out = new Float64Array(count);
      let i = 0;
      while (i < count) {
        if (blockPos === lf) nextBlock();
        const take = Math.min(count - i, lf - blockPos);
        out.set(block.subarray(blockPos, blockPos + take), i);
        i += take;
        blockPos += take;
      }
      position += count;
      return out;
    },
  };
}

/**
 * `length` samples of seeded coloured Gaussian noise with one-sided PSD `psd` at `sampleRate` Hz
 * (see {@link createNoiseStream} for the method, the normalisation and the low-frequency hold).
 */
export function colouredNoise(psd: PsdInput, length: number, sampleRate: number, seed: string | number): Float64Array {
  if (!Number.isInteger(length) || length < 0) throw new InputError(`noise: length must be a non-negative integer (got ${length})`);
  return createNoiseStream({ psd, sampleRate, seed }).next(length);
}
