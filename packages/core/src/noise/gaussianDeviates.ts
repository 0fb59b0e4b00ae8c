import seedrandom from "seedrandom";

/** A seeded stream of independent standard normal deviates (mean 0, variance 1). */
export interface GaussianDeviates {
  /** Fills `out` with the next `out.length` deviates of the stream. */
  fill(out: Float64Array): void;
}

/**
 * Standard normal deviates by the Box–Muller transform (Box & Muller, Ann. Math. Stat. 29, 610
 * (1958)): for independent uniforms u1 ∈ (0, 1], u2 ∈ [0, 1), z0 = √(−2 ln u1) cos 2πu2 and
 * z1 = √(−2 ln u1) sin 2πu2 are independent N(0, 1). The uniforms come from seedrandom's
 * xor4096 generator (53-bit doubles), seeded with `seed`, so the same seed gives the same stream
 * however it is split into `fill` calls.
 */
export function createGaussianDeviates(seed: string | number): GaussianDeviates {
  const rng = seedrandom.xor4096(String(seed));
  let spare = 0;
  let haveSpare = false;
  return {
    fill(out: Float64Array): void {
      let i = 0;
      const n = out.length;
      if (haveSpare && n > 0) {
        out[i++] = spare;
        haveSpare = false;
      }
      while (i < n) {
        const u1 = 1 - rng.double();
        const u2 = rng.double();
        const r = Math.sqrt(-2 * Math.log(u1));
        const a = 2 * Math.PI * u2;
        out[i++] = r * Math.cos(a);
        const z1 = r * Math.sin(a);
        if (i < n) out[i++] = z1;
        else {
          spare = z1;
          haveSpare = true;
        }
      }
    },
  };
}
