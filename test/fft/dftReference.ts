import seedrandom from "seedrandom";

/**
 * Naive O(N²) DFT of an interleaved complex array, straight from the definition
 * X[k] = Σ_n x[n] e^{sign·2πikn/N} (sign −1 forward, +1 unnormalised inverse; common practice,
 * no source). Twiddles come from one table indexed by (k·n) mod N, each computed in double.
 */
export function naiveDft(x: ArrayLike<number>, sign: -1 | 1): Float64Array {
  const n = x.length / 2;
  const cos = new Float64Array(n);
  const sin = new Float64Array(n);
  for (let m = 0; m < n; m++) {
    cos[m] = Math.cos((2 * Math.PI * m) / n);
    sin[m] = sign * Math.sin((2 * Math.PI * m) / n);
  }
  const out = new Float64Array(2 * n);
  for (let k = 0; k < n; k++) {
    let re = 0;
    let im = 0;
    for (let j = 0; j < n; j++) {
      const m = (k * j) % n;
      const c = cos[m];
      const s = sin[m];
      re += x[2 * j] * c - x[2 * j + 1] * s;
      im += x[2 * j] * s + x[2 * j + 1] * c;
    }
    out[2 * k] = re;
    out[2 * k + 1] = im;
  }
  return out;
}

/** max |a − b| / max |b| over the first `b.length` entries. */
export function maxRelError(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let num = 0;
  let den = 0;
  for (let i = 0; i < b.length; i++) {
    num = Math.max(num, Math.abs(a[i] - b[i]));
    den = Math.max(den, Math.abs(b[i]));
  }
  return num / den;
}

/** `length` uniform draws in [−0.5, 0.5) from a seeded generator. */
export function seededNoise(seed: string, length: number): Float64Array {
  const rng = seedrandom(seed);
  return new Float64Array(length).map(() => rng() - 0.5);
}

/** Interleaved complex array with the given real parts and zero imaginary parts. */
export function realToComplex(real: ArrayLike<number>): Float64Array {
  const out = new Float64Array(2 * real.length);
  for (let i = 0; i < real.length; i++) out[2 * i] = real[i];
  return out;
}

/** Powers of two 2^from .. 2^to. */
export function powersOfTwo(from: number, to: number): number[] {
  const sizes: number[] = [];
  for (let p = from; p <= to; p++) sizes.push(2 ** p);
  return sizes;
}
