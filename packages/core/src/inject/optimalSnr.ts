import { InputError } from "../errors.js";
import { createRealFft } from "../fft/create.js";
import type { Detector } from "../waveform/antenna.js";
import { type Injection, projectInjection } from "./injection.js";

/** Anything that gives a one-sided PSD S_n(f) in 1/Hz (a PsdModel fits). */
export interface PsdLike {
  evaluate(fHz: number): number;
}

/**
 * Optimal SNR of a sampled strain segment: ρ² = 4 Σ_k |h̃(f_k)|² / S_n(f_k) Δf over fMinHz ≤ f_k < Nyquist
 * (the inner product (h|h) of Finn, Phys. Rev. D 46, 5236 (1992); the project's Fourier convention (DEVELOPERS.md)),
 * with h̃(f_k) = Δt · DFT(h)_k of the series zero-padded to a power of two, Δf = 1/(N Δt).
 * Bins where S_n is not a positive finite number are skipped.
 */
export function optimalSnrOfSeries(data: Float64Array, psd: PsdLike, sampleRate: number, fMinHz: number): number {
  if (!(sampleRate > 0) || !Number.isFinite(sampleRate)) throw new InputError(`sampleRate must be a positive number (got ${sampleRate})`);
  if (!(fMinHz >= 0) || !Number.isFinite(fMinHz)) throw new InputError(`fMinHz must be a non-negative number (got ${fMinHz})`);
  if (data.length === 0) return 0;
  let size = 2;
  while (size < data.length) size *= 2;
  const input = new Float64Array(size);
  input.set(data);
  const out = new Float64Array(size + 2);
  createRealFft(size).forward(input, out);
  const dt = 1 / sampleRate;
  const df = sampleRate / size;
  let sum = 0;
  const kMin = Math.max(1, Math.ceil(fMinHz / df));
  for (let k = kMin; k < size / 2; k++) {
    const s = psd.evaluate(k * df);
    if (!(s > 0) || !Number.isFinite(s)) continue;
    const re = out[2 * k];
    const im = out[2 * k + 1];
    sum += (re * re + im * im) / s;
  }
  return Math.sqrt(4 * sum * dt * dt * df);
}

/**
 * Optimal SNR sqrt(4 ∫ |h̃|² / S_n df) of an injection's projected TaylorT4 signal in `detector`
 * (see {@link projectInjection}), from fMinHz to the Nyquist frequency.
 */
export function optimalSnr(injection: Injection, psd: PsdLike, sampleRate: number, fMinHz: number, detector: Detector): number {
  const segment = projectInjection(injection, detector, { sampleRate, fMinHz, gridStartTime: injection.coalescenceTime });
  return optimalSnrOfSeries(segment.data, psd, sampleRate, fMinHz);
}
