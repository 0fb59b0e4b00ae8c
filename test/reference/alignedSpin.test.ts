// Aligned-spin TaylorF2 against the published spin parameters and against the energy-balance
// series of the spin-orbit energy and flux; the orbital hang-up in cycle counts.
import { describe, expect, it } from "vitest";
import { taylorT4SpinCorrections } from "../../packages/core/src/waveform/alignedSpinEnergyFlux.js";
import { addAlignedSpinPhaseTermsInto, spinOrbitBeta, spinSpinSigma } from "../../packages/core/src/waveform/alignedSpinPhase.js";
import { gwCycleCounts, stationaryPhaseCycles } from "../../packages/core/src/waveform/cycles.js";
import { taylorF2PhaseCoefficients } from "../../packages/core/src/waveform/pnCoefficients.js";

const BINARIES: [number, number, number, number][] = [
  // m1, m2 (M_sun), χ1, χ2
  [1.4, 1.4, 0.05, 0.02],
  [10, 6, 0.6, 0.6],
  [20, 3, 0.9, 0.1],
  [5, 5, -0.7, 0.4],
  [2, 30, 0.3, -0.8],
  [1.2, 40, -0.5, 0.95],
];

/** Spin part of the TaylorF2 coefficients: (a_spin, b_spin), k = 0..7. */
function spinTerms(m1: number, m2: number, chi1: number, chi2: number) {
  const eta = (m1 * m2) / ((m1 + m2) * (m1 + m2));
  const base = taylorF2PhaseCoefficients(eta, 7);
  const spun = taylorF2PhaseCoefficients(eta, 7);
  addAlignedSpinPhaseTermsInto(m1, m2, chi1, chi2, 7, spun.a, spun.b);
  return {
    a: Array.from(spun.a, (v, k) => v - base.a[k]),
    b: Array.from(spun.b, (v, k) => v - base.b[k]),
  };
}

describe("1.5PN spin-orbit and 2PN spin-spin coefficients (Poisson & Will, Phys. Rev. D 52, 848 (1995); Kidder, Will & Wiseman, Phys. Rev. D 47, R4183 (1993))", () => {
  for (const [m1, m2, chi1, chi2] of BINARIES) {
    it(`${m1}+${m2} M_sun, χ = ${chi1}, ${chi2}: the v³ term moves by 4β, β = (1/12) Σ χᵢ (113 mᵢ²/M² + 75η) (from memory)`, () => {
      const M = m1 + m2;
      const eta = (m1 * m2) / (M * M);
      const beta = (chi1 * (113 * (m1 / M) ** 2 + 75 * eta) + chi2 * (113 * (m2 / M) ** 2 + 75 * eta)) / 12;
      expect(spinTerms(m1, m2, chi1, chi2).a[3]).toBeCloseTo(4 * beta, 12);
      expect(spinOrbitBeta(m1, m2, chi1, chi2)).toBeCloseTo(beta, 13);
    });
    it(`${m1}+${m2} M_sun, χ = ${chi1}, ${chi2}: the v⁴ term moves by −10σ, σ in its vector form with L̂·χᵢ = χᵢ (from memory)`, () => {
      // σ = η [721 (L̂·χ1)(L̂·χ2) − 247 χ1·χ2] / 48 (Kidder, Will & Wiseman 1993; Poisson & Will 1995)
      //   + Σᵢ (mᵢ/M)² [(720κ − 1)(L̂·χᵢ)² − (240κ − 7) χᵢ²] / 96 with κ = 1 for black holes
      // (quadrupole–monopole: Poisson, Phys. Rev. D 57, 5287 (1998); spin-squared: Mikóczi, Vasúth &
      // Gergely, Phys. Rev. D 71, 124043 (2005)); aligned spins have L̂·χᵢ = χᵢ, χ1·χ2 = χ1χ2.
      const M = m1 + m2;
      const eta = (m1 * m2) / (M * M);
      const kappa = 1;
      const self = (x: number, chi: number) => (x * x * ((720 * kappa - 1) * chi * chi - (240 * kappa - 7) * chi * chi)) / 96;
      const sigma = (eta * (721 * chi1 * chi2 - 247 * chi1 * chi2)) / 48 + self(m1 / M, chi1) + self(m2 / M, chi2);
      expect(spinTerms(m1, m2, chi1, chi2).a[4]).toBeCloseTo(-10 * sigma, 11);
      expect(spinSpinSigma(m1, m2, chi1, chi2)).toBeCloseTo(sigma, 12);
    });
  }
  it("the interaction part alone is (79/8) η χ1χ2 and the quadrupole–monopole part (5/2) κ (3 − 1) Σ (mᵢ/M)² χᵢ² (Poisson 1998, aligned)", () => {
    const [m1, m2] = [12, 7];
    const eta = (m1 * m2) / 19 ** 2;
    // One spin at a time isolates the self terms; their κ-dependence is the quadrupole–monopole term.
    const selfOnly = spinSpinSigma(m1, m2, 0.6, 0);
    const kappaSlope = spinSpinSigma(m1, m2, 0.6, 0, 2) - selfOnly;
    expect(kappaSlope).toBeCloseTo(2.5 * 2 * (m1 / 19) ** 2 * 0.36, 12);
    const both = spinSpinSigma(m1, m2, 0.6, -0.3) - selfOnly - spinSpinSigma(m1, m2, 0, -0.3);
    expect(both).toBeCloseTo((79 / 8) * eta * 0.6 * -0.3, 12);
  });
});

describe("spin-orbit phase terms through 3.5PN follow from the published spin-orbit energy and flux by energy balance", () => {
  // E = −(μ v²/2)[1 + Σ e_k v^k], F = (32/5) η² v¹⁰ [1 + Σ f_k v^k] with the spin-orbit terms of
  // Blanchet, Living Rev. Relativ. 17, 2 (2014), circular orbits, spins along L̂, in units of G M²:
  //   e3 = 14/3 S + 2δΣ, e5 = (11 − 61η/9) S + δ(3 − 10η/3) Σ, e7 = (135/4 − 367η/4 + 29η²/12) S + δ(27/4 − 39η + 5η²/4) Σ;
  //   f3 = 4π − 4S − (5/4)δΣ, f5 = (−9/2 + 272η/9) S + (−13/16 + 43η/4) δΣ, f6 = −16π S − (31π/6) δΣ,
  //   f7 = (476645/6804 + 6172η/189 − 2810η²/27) S + (9535/336 + 1849η/126 − 1501η²/36) δΣ,
  // S = Σ (mᵢ/M)² χᵢ, Σ = (m2 χ2 − m1 χ1)/M, δ = (m1 − m2)/M (from memory), with the non-spinning
  // 2PN e2, e4, f2, f4 of the same review. dt/dv ∝ −v⁻⁹ R(v), R = [Σ (k+2)/2 e_k v^k] / [Σ f_k v^k];
  // the stationary-phase phase then has v^k coefficient 40 r_k / ((k − 8)(k − 5)) for k ≠ 5 and the
  // ln v coefficient −(40/3) r_5 at k = 5 (Cutler & Flanagan, Phys. Rev. D 49, 2658 (1994), the
  // stationary-phase integral). The phase coefficients under test come from other papers (Arun et al.
  // 2009; Bohé, Marsat & Blanchet 2013), so agreement checks both recollections.
  const mul = (a: number[], b: number[]) => {
    const c = new Array(8).fill(0);
    for (let i = 0; i < 8; i++) for (let j = 0; i + j < 8; j++) c[i + j] += a[i] * b[j];
    return c;
  };
  const inv = (a: number[]) => {
    const c = new Array(8).fill(0);
    c[0] = 1 / a[0];
    for (let k = 1; k < 8; k++) {
      let s = 0;
      for (let j = 1; j <= k; j++) s += a[j] * c[k - j];
      c[k] = -s / a[0];
    }
    return c;
  };
  /** Ratio series R for spins scaled by s (s → 0 isolates the linear part). */
  const ratio = (m1: number, m2: number, chi1: number, chi2: number, s: number) => {
    const M = m1 + m2, x1 = m1 / M, x2 = m2 / M, eta = x1 * x2, d = x1 - x2, pi = Math.PI;
    const S = s * (x1 * x1 * chi1 + x2 * x2 * chi2);
    const dSig = s * d * (x2 * chi2 - x1 * chi1);
    const e = [1, 0, -(3 / 4 + eta / 12), (14 / 3) * S + 2 * dSig, -(27 / 8 - (19 / 8) * eta + (eta * eta) / 24),
      (11 - (61 / 9) * eta) * S + (3 - (10 / 3) * eta) * dSig, 0,
      (135 / 4 - (367 / 4) * eta + (29 / 12) * eta * eta) * S + (27 / 4 - 39 * eta + (5 / 4) * eta * eta) * dSig];
    const f = [1, 0, -(1247 / 336 + (35 / 12) * eta), 4 * pi - 4 * S - (5 / 4) * dSig,
      -44711 / 9072 + (9271 / 504) * eta + (65 / 18) * eta * eta,
      (-9 / 2 + (272 / 9) * eta) * S + (-13 / 16 + (43 / 4) * eta) * dSig, -16 * pi * S - ((31 * pi) / 6) * dSig,
      (476645 / 6804 + (6172 / 189) * eta - (2810 / 27) * eta * eta) * S + (9535 / 336 + (1849 / 126) * eta - (1501 / 36) * eta * eta) * dSig];
    return mul(e.map((v, k) => (v * (k + 2)) / 2), inv(f));
  };
  for (const [m1, m2, chi1, chi2] of BINARIES) {
    it(`${m1}+${m2} M_sun, χ = ${chi1}, ${chi2}: 1.5, 2.5, 3 and 3.5PN spin-orbit terms to 1e-6 relative`, () => {
      const h = 1e-4;
      const plus = ratio(m1, m2, chi1, chi2, h);
      const minus = ratio(m1, m2, chi1, chi2, -h);
      const r = plus.map((v, k) => (v - minus[k]) / (2 * h)); // linear part (central difference; exact for the linear terms up to h²)
      // Linear-in-spin part of the tested coefficients: spin-spin enters only at k = 4, so take the
      // odd part in the spins.
      const p = spinTerms(m1, m2, chi1, chi2);
      const q = spinTerms(m1, m2, -chi1, -chi2);
      const odd = (x: number[], y: number[], k: number) => (x[k] - y[k]) / 2;
      const expected = { 3: 4 * r[3], 6: -20 * r[6], 7: -20 * r[7] } as Record<number, number>;
      for (const k of [3, 6, 7]) {
        expect(Math.abs(odd(p.a, q.a, k) - expected[k])).toBeLessThan(1e-6 * Math.max(1, Math.abs(expected[k])));
      }
      const b5 = -(40 / 3) * r[5];
      expect(Math.abs(odd(p.b, q.b, 5) - b5)).toBeLessThan(1e-6 * Math.max(1, Math.abs(b5)));
    });
    it(`${m1}+${m2} M_sun, χ = ${chi1}, ${chi2}: the TaylorT4 spin corrections are the spin-linear part of F/E′ (and σ at v⁴) to 1e-6`, () => {
      const h = 1e-4;
      const inv1 = (a: number[]) => inv(a);
      const plus = inv1(ratio(m1, m2, chi1, chi2, h));
      const minus = inv1(ratio(m1, m2, chi1, chi2, -h));
      const t4 = taylorT4SpinCorrections(m1, m2, chi1, chi2);
      for (const k of [3, 5, 6, 7]) {
        const expected = (plus[k] - minus[k]) / (2 * h);
        expect(Math.abs(t4[k] - expected)).toBeLessThan(1e-6 * Math.max(1, Math.abs(expected)));
      }
      expect(t4[4]).toBeCloseTo(spinSpinSigma(m1, m2, chi1, chi2), 12);
      expect([t4[0], t4[1], t4[2]]).toEqual([0, 0, 0]);
    });
  }
});

describe("orbital hang-up: aligned spins lengthen the inspiral, anti-aligned shorten it (Kidder, Will & Wiseman 1993; common practice)", () => {
  for (const [m1, m2, label] of [[1.4, 1.4, "BNS"], [1.6, 1.2, "BNS"], [10, 10, "BBH"], [30, 25, "BBH"], [10, 1.4, "NSBH"]] as const) {
    it(`${label} ${m1}+${m2} M_sun: GW cycles from 30 Hz to the ISCO increase monotonically with an equal aligned spin χ1 = χ2 ∈ [−0.9, 0.9]`, () => {
      const spins = Array.from({ length: 19 }, (_, i) => -0.9 + 0.1 * i);
      const cycles = spins.map((chi) => stationaryPhaseCycles(m1, m2, 30, undefined, chi, chi));
      for (let i = 1; i < cycles.length; i++) expect(cycles[i]).toBeGreaterThan(cycles[i - 1]);
    });
  }
  it("without spins the stationary-phase count equals the orbital-phase count of gwCycleCounts within 0.1 % (the same series in two forms)", async () => {
    for (const [m1, m2] of [[1.4, 1.4], [10, 6], [30, 25]]) {
      const a = stationaryPhaseCycles(m1, m2, 30);
      const b = gwCycleCounts(m1, m2, 30).total;
      expect(Math.abs(a - b) / b).toBeLessThan(1e-3);
    }
  });
});
