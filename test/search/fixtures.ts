// Shared set-up for search tests: seeded noise with TaylorT4 injections, and a plain template grid.
import { createComplexFft, colouredNoise, optimalSnr, type Injection, type PsdModel, type SearchOptions, type SearchTemplate } from "@chirpsieve/core";
import { injectInto } from "../../packages/core/src/inject/injection.js";
import { SITE_A, geocentreDelay, siderealAngle } from "../../packages/core/src/waveform/antenna.js";
import { taylorF2Into } from "../../packages/core/src/waveform/taylorf2.js";

/** An injection with fixed angles (overhead-ish, face-on) at 100 Mpc; distance set later by SNR. */
export function injectionAt(m1: number, m2: number, coalescenceTime: number, extra: Partial<Injection> = {}): Injection {
  return {
    primaryMassSolar: m1,
    secondaryMassSolar: m2,
    coalescenceTime,
    distanceMpc: 100,
    inclination: 0.3,
    rightAscension: 1.1,
    declination: 0.4,
    polarisation: 0.2,
    phase: 0.7,
    ...extra,
  };
}

/** Rescales the injection's distance so its optimal SNR in `psd` is `snr` (SNR ∝ 1/distance). */
export function atSnr(inj: Injection, snr: number, psd: PsdModel, fs: number, fMin: number): Injection {
  const rho = optimalSnr(inj, psd, fs, fMin, SITE_A);
  return { ...inj, distanceMpc: (inj.distanceMpc * rho) / snr, optimalSnr: snr };
}

/** When the injected signal reaches its ISCO at SITE_A (Earth-centre time plus the plane-wave delay). */
export function arrivalTime(inj: Injection): number {
  return inj.coalescenceTime + geocentreDelay(SITE_A, inj, siderealAngle(inj.coalescenceTime));
}

/** Seeded coloured noise (or none) plus the injections projected on SITE_A. */
export function simulatedData(options: {
  psd: PsdModel;
  fs: number;
  seconds: number;
  seed: string;
  fMin: number;
  injections?: Injection[];
  noise?: boolean;
}): Float64Array {
  const n = Math.round(options.seconds * options.fs);
  const data = options.noise === false ? new Float64Array(n) : colouredNoise(options.psd, n, options.fs, options.seed);
  for (const inj of options.injections ?? []) injectInto(data, options.fs, 0, inj, SITE_A, options.fMin);
  return data;
}

/**
 * A plain grid of templates: chirp masses from mcMin to mcMax in relative steps `step`, at the
 * given mass ratios q = m2/m1 (a stand-in bank for engine tests; the lattice bank has its own).
 */
export function chirpMassGrid(mcMin: number, mcMax: number, step: number, ratios: number[]): SearchTemplate[] {
  const out: SearchTemplate[] = [];
  for (const q of ratios) {
    const eta = q / (1 + q) ** 2;
    for (let mc = mcMin; mc <= mcMax; mc *= 1 + step) {
      const m = mc / eta ** 0.6;
      out.push({ primaryMassSolar: m / (1 + q), secondaryMassSolar: (m * q) / (1 + q) });
    }
  }
  return out;
}

/**
 * A TaylorF2 chirp (the search's own waveform family) coalescing at t0 in a series of n samples,
 * optimally oriented at 1 Mpc: the inverse FFT of h̃(f) e^{−2πift0} (the project's convention);
 * aligned spins chi1, chi2 (default 0).
 */
export function taylorF2Chirp(m1: number, m2: number, t0: number, n: number, fs: number, fMin: number, chi1 = 0, chi2 = 0): Float64Array {
  const df = fs / n;
  const h = new Float64Array(2 * n);
  taylorF2Into(h, n / 2 + 1, df, fMin, m1, m2, 1, Infinity, 7, chi1, chi2);
  for (let k = 0; k <= n / 2; k++) {
    const a = -2 * Math.PI * k * df * t0;
    const c = Math.cos(a);
    const s = Math.sin(a);
    const re = h[2 * k];
    const im = h[2 * k + 1];
    h[2 * k] = re * c - im * s;
    h[2 * k + 1] = re * s + im * c;
    if (k > 0 && k < n / 2) {
      h[2 * (n - k)] = h[2 * k];
      h[2 * (n - k) + 1] = -h[2 * k + 1];
    }
  }
  const out = new Float64Array(2 * n);
  createComplexFft(n).inverse(h, out);
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = out[2 * i] * df;
  return x;
}

/**
 * The search settings most tests use: 16 chi-squared bands, the loudest peak kept within ± 1 s, a median Welch
 * PSD from 4 s segments and the SIMD FFT (call loadFftBackends() first).
 */
export function standardSearch(templates: SearchTemplate[], fMinHz: number, snrThreshold: number): SearchOptions {
  return {
    templates,
    fMinHz,
    snrThreshold,
    chi2Bands: 16,
    loudestWithinSeconds: 1,
    psd: { kind: "estimate", segmentSeconds: 4, average: "median" },
    fftBackend: "pffft",
  };
}
