import { describe, expect, it } from "vitest";
import { ajith2011, createComplexFft } from "@chirpsieve/core";
import { createRealFft } from "../../packages/core/src/fft/create.js";
import { C, MPC, T_SUN } from "../../packages/core/src/physics/constants.js";
import { taylorF2Into, taylorF2BinRange } from "../../packages/core/src/waveform/taylorf2.js";

// The stationary-phase template against the FFT of a time-domain Newtonian chirp built here
// independently of the library. This pins the project's sign convention: an FFT of a chirp that
// coalesces at t = t_c equals taylorF2Into(...) × e^{−2πi f t_c} (h̃(f) = ∫ h(t) e^{−2πift} dt).

const m1 = 1.4;
const m2 = 1.4;
const fs = 4096; // Hz; Nyquist 2048 Hz lies above the ISCO frequency (≈1570 Hz) of 2.8 M_sun
const n = 1 << 19; // 128 s
const dt = 1 / fs;
const df = fs / n;
const fLow = 30;
const fStart = 25; // the chirp starts below fLow so the taper lies outside the template band
const tStart = 1; // s of zeros before the chirp
const taperSeconds = 1;

const mTotal = (m1 + m2) * T_SUN; // s
const eta = (m1 * m2) / ((m1 + m2) * (m1 + m2));
const mc = Math.pow(eta, 0.6) * mTotal; // chirp mass in seconds
const distance = 1 * MPC;
const fIsco = 1 / (Math.pow(6, 1.5) * Math.PI * mTotal); // Schwarzschild ISCO; common practice

/**
 * Newtonian (quadrupole) chirp, Peters & Mathews, Phys. Rev. 131, 435 (1963):
 *   dF/dt = (96/5) π^{8/3} Mc^{5/3} F^{11/3}  ⇒  F(τ) = (1/π) (5 / (256 τ))^{3/8} Mc^{−5/8},  τ = t_c − t,
 *   dφ/dt = 2π F  ⇒  φ(τ) = φ_c − 2 (τ / (5 Mc))^{5/8}   (integrated in closed form),
 *   h(t) = 4 (c/D) Mc^{5/3} (π F)^{2/3} cos φ  (optimally oriented; Sathyaprakash & Schutz, Living
 *   Rev. Relativ. 12, 2 (2009)), started at F = 25 Hz with a sin² taper over 1 s, stopped at the ISCO.
 */
function newtonianChirp(): { h: Float64Array; tc: number; checkOde: number } {
  const tauStart = (5 / 256) * Math.pow(mc, -5 / 3) * Math.pow(Math.PI * fStart, -8 / 3);
  const tc = tStart + tauStart;
  const h = new Float64Array(n);
  const freq = (tau: number) => (1 / Math.PI) * Math.pow(5 / (256 * tau), 3 / 8) * Math.pow(mc, -5 / 8);
  const phase = (tau: number) => -2 * Math.pow(tau / (5 * mc), 5 / 8);
  let checkOde = 0;
  for (let i = 0; i < n; i++) {
    const t = i * dt;
    if (t < tStart) continue;
    const tau = tc - t;
    if (!(tau > 0)) break;
    const f = freq(tau);
    if (f > fIsco) break;
    // The closed form really integrates dφ/dt = 2πF: central difference, relative check.
    if (i % 50_000 === 0 && tau > 1e-3) {
      const e = 1e-4;
      const dphi = (phase(tau - e) - phase(tau + e)) / (2 * e);
      checkOde = Math.max(checkOde, Math.abs(dphi / (2 * Math.PI * f) - 1));
    }
    const amp = 4 * (C / distance) * Math.pow(mc, 5 / 3) * Math.pow(Math.PI * f, 2 / 3);
    const u = (t - tStart) / taperSeconds;
    const w = u < 1 ? Math.sin((Math.PI / 2) * u) ** 2 : 1;
    h[i] = w * amp * Math.cos(phase(tau));
  }
  return { h, tc, checkOde };
}

describe("TaylorF2 (Newtonian) against the FFT of a time-domain Newtonian chirp, 1.4+1.4 M_sun from 30 Hz", () => {
  const { h, tc, checkOde } = newtonianChirp();
  const nBins = n / 2 + 1;
  const spec = new Float64Array(n + 2);
  createRealFft(n).forward(h, spec);
  for (let i = 0; i < spec.length; i++) spec[i] *= dt; // continuous-transform normalisation
  const tmpl = new Float64Array(2 * nBins);
  const kEnd = taylorF2Into(tmpl, nBins, df, fLow, m1, m2, 1, Infinity, 0);
  const { kStart } = taylorF2BinRange(nBins, df, fLow, m1, m2);
  const psd = new Float64Array(nBins);
  for (let k = kStart; k < kEnd; k++) psd[k] = ajith2011.evaluate(k * df);

  /** (a|b) = 4 Re Σ a b* / S df over the template band (project convention). */
  function norm2(a: Float64Array): number {
    let s = 0;
    for (let k = kStart; k < kEnd; k++) s += (a[2 * k] ** 2 + a[2 * k + 1] ** 2) / psd[k];
    return 4 * df * s;
  }
  const sigmaData = Math.sqrt(norm2(spec));
  const sigmaTmpl = Math.sqrt(norm2(tmpl));

  /** max over time shift and phase of |z(t)| / (σ_data σ_tmpl), z = 4 df Σ x̃ conj(t̃) / S e^{+2πi f t}; also the best lag (s). */
  function maximisedOverlap(template: Float64Array): { overlap: number; lag: number } {
    const q = new Float64Array(2 * n);
    for (let k = kStart; k < kEnd; k++) {
      const xr = spec[2 * k], xi = spec[2 * k + 1];
      const tr = template[2 * k], ti = template[2 * k + 1];
      q[2 * k] = (xr * tr + xi * ti) / psd[k];
      q[2 * k + 1] = (xi * tr - xr * ti) / psd[k];
    }
    const z = new Float64Array(2 * n);
    createComplexFft(n).inverse(q, z);
    let best = 0, iBest = 0;
    for (let i = 0; i < n; i++) {
      const a = z[2 * i] ** 2 + z[2 * i + 1] ** 2;
      if (a > best) { best = a; iBest = i; }
    }
    return { overlap: (4 * df * Math.sqrt(best)) / (sigmaData * sigmaTmpl), lag: iBest * dt };
  }

  it("builds the chirp from the integrated Newtonian frequency evolution (dφ/dt = 2πF to 1e-6)", () => {
    expect(checkOde).toBeLessThan(1e-6);
    expect(kStart).toBe(Math.ceil(fLow / df));
    expect(kEnd).toBe(Math.floor(fIsco / df) + 1);
  });

  it("overlap maximised over time and phase ≥ 0.99, at the lag t_c (sign of the time convention)", () => {
    const { overlap, lag } = maximisedOverlap(tmpl);
    expect(overlap).toBeGreaterThan(0.99);
    expect(Math.abs(lag - tc)).toBeLessThanOrEqual(dt);
  });

  it("FFT ≈ taylorF2Into × e^{−2πi f t_c}: overlap ≥ 0.99, amplitude ratio within 2%, residual phase < 0.05 rad (φ_c = 0)", () => {
    let re = 0, im = 0;
    for (let k = kStart; k < kEnd; k++) {
      const f = k * df;
      const c = Math.cos(2 * Math.PI * f * tc), s = -Math.sin(2 * Math.PI * f * tc);
      const tr = tmpl[2 * k] * c - tmpl[2 * k + 1] * s;
      const ti = tmpl[2 * k] * s + tmpl[2 * k + 1] * c;
      re += (spec[2 * k] * tr + spec[2 * k + 1] * ti) / psd[k];
      im += (spec[2 * k + 1] * tr - spec[2 * k] * ti) / psd[k];
    }
    const overlap = (4 * df * Math.hypot(re, im)) / (sigmaData * sigmaTmpl);
    const phaseOffset = Math.atan2(im, re);
    const ratio = sigmaData / sigmaTmpl;
    expect(overlap).toBeGreaterThan(0.99);
    expect(Math.abs(ratio - 1)).toBeLessThan(0.02);
    // The chirp has GW phase 0 at t_c, so φ_c = 0 of the template must leave no residual phase.
    expect(Math.abs(phaseOffset)).toBeLessThan(0.05);
  });

  it("the opposite sign (e^{+iΨ}) does not match (overlap < 0.1)", () => {
    const conj = new Float64Array(tmpl);
    for (let k = 0; k < nBins; k++) conj[2 * k + 1] = -conj[2 * k + 1];
    const { overlap } = maximisedOverlap(conj);
    expect(overlap).toBeLessThan(0.1);
  });
});
