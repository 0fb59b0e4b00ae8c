import { InputError } from "../errors.js";
import { MPC } from "../physics/constants.js";
import { TAYLOR_T4_MAX_ORDER, restrictedAmplitude, taylorT4Evolution } from "./taylorT4Evolution.js";

/** Parameters of a TaylorT4 inspiral sampled on a uniform time grid. */
export interface TaylorT4Options {
  /** Component masses, solar masses. */
  massSolar1: number;
  massSolar2: number;
  /** Luminosity distance, Mpc. */
  distanceMpc: number;
  /** Inclination ι of the orbital angular momentum to the line of sight, rad (0 = face-on). */
  inclination: number;
  /** Orbital phase φ at the coalescence time, rad (the GW phase there is 2φ). */
  coalescencePhase: number;
  /**
   * Coalescence time, s, in the grid's time base: the moment the TaylorT4 evolution reaches the
   * ISCO (v = 1/√6). Any float: it is not rounded to a sample.
   */
  coalescenceTime: number;
  /** Samples per second of the output grid. */
  sampleRate: number;
  /** Time (s) of grid sample 0; sample i is at gridStartTime + i / sampleRate. Default 0. */
  gridStartTime?: number;
  /** GW frequency (Hz) at which the waveform starts (it is tapered in from there). */
  fStartHz: number;
  /**
   * GW frequency (Hz) at which the waveform ends (tapered out). Default: the ISCO frequency or
   * 0.9 × Nyquist, whichever is lower, so that the sampled chirp does not alias. At most the ISCO.
   */
  fEndHz?: number;
  /** Length of the Hann taper at the start, in GW cycles (default 4). */
  startTaperCycles?: number;
  /** Length of the Hann taper at the end, in GW cycles (default 1). */
  endTaperCycles?: number;
  /** Highest power of v kept in the TaylorT4 series (default 7 = 3.5PN; 0 = Newtonian). */
  pnOrder?: number;
  /**
   * Dimensionless spins χ1, χ2 ∈ (−1, 1) of the two bodies along the orbital angular momentum
   * (default 0); they enter the orbital evolution (waveform/alignedSpinEnergyFlux.ts), not the amplitude.
   */
  chi1?: number;
  chi2?: number;
}

/** A sampled two-polarisation waveform segment on a uniform grid. */
export interface TimeDomainWaveform {
  /** Grid index of hPlus[0] (may be negative): its time is gridStartTime + startIndex / sampleRate. */
  startIndex: number;
  hPlus: Float64Array;
  hCross: Float64Array;
  sampleRate: number;
  gridStartTime: number;
  /** The frequencies (Hz) at which the waveform actually starts and ends. */
  fStartHz: number;
  fEndHz: number;
  /** Times (s, grid time base) at which the GW frequency passes fStartHz and fEndHz. */
  startTime: number;
  endTime: number;
}

/** Largest relative change of v allowed in one RK4 sub-step. */
const MAX_DV_OVER_V = 1e-3;

/**
 * TaylorT4 time-domain inspiral of a quasi-circular binary (aligned spins optional), sampled at exactly the grid
 * times t_i = gridStartTime + i / sampleRate.
 *
 * The orbit follows dv/dt = (32η/5M) v⁹ Σ a_k v^k (TaylorT4 to 3.5PN: Buonanno, Iyer, Ochsner, Pan &
 * Sathyaprakash, Phys. Rev. D 80, 084043 (2009), Eq. (3.6); energy and flux from Blanchet, Living
 * Rev. Relativ. 17, 2 (2014), Eqs. (233), (314)) and dφ/dt = v³/M. It is integrated with classical
 * RK4 backwards in time from the end frequency, whose time and phase relative to the coalescence
 * (ISCO crossing at `coalescenceTime`, orbital phase `coalescencePhase`) come from quadrature; the
 * first step is the fractional one that lands on a grid sample, so t_c is never rounded. Steps are
 * split into sub-steps where v changes by more than 0.1 % per sample (near merger).
 *
 * Polarisations (restricted PN, Newtonian amplitude; Blanchet 2014, Eqs. (237)–(240), leading term):
 *   h+ = −A(v) (1 + cos²ι) cos 2φ,  h× = −2 A(v) cos ι sin 2φ,  A = 2 G μ v² / (c² D),
 * so the face-on amplitude equals the quadrupole h0 = 4 (G Mc)^{5/3} (π f)^{2/3} / (c⁴ D)
 * (Peters & Mathews, Phys. Rev. 131, 435 (1963)). Both ends are multiplied by Hann tapers that are
 * functions of the orbital phase (so they do not depend on where the samples fall).
 */
export function taylorT4(options: TaylorT4Options): TimeDomainWaveform {
  const o = options;
  const ev = taylorT4Evolution(o.massSolar1, o.massSolar2, o.pnOrder ?? TAYLOR_T4_MAX_ORDER, o.chi1 ?? 0, o.chi2 ?? 0);
  const fs = o.sampleRate;
  if (!(fs > 0) || !Number.isFinite(fs)) throw new InputError(`sampleRate must be a positive number (got ${fs})`);
  if (!(o.distanceMpc > 0) || !Number.isFinite(o.distanceMpc)) {
    throw new InputError(`distance must be a positive number of Mpc (got ${o.distanceMpc})`);
  }
  for (const [name, value] of [
    ["inclination", o.inclination],
    ["coalescence phase", o.coalescencePhase],
    ["coalescence time", o.coalescenceTime],
    ["grid start time", o.gridStartTime ?? 0],
  ] as const) {
    if (!Number.isFinite(value)) throw new InputError(`${name} must be a finite number (got ${value})`);
  }
  const fEnd = o.fEndHz ?? Math.min(ev.fIscoHz, 0.45 * fs);
  if (!(fEnd > 0) || fEnd > ev.fIscoHz * (1 + 1e-12)) {
    throw new InputError(
      `fEndHz must be in (0, ${ev.fIscoHz.toFixed(2)}] Hz, the ISCO of ${o.massSolar1}+${o.massSolar2} M_sun (got ${o.fEndHz})`,
    );
  }
  if (!(o.fStartHz > 0) || !(o.fStartHz < fEnd)) {
    throw new InputError(`fStartHz must be positive and below the end frequency ${fEnd.toFixed(2)} Hz (got ${o.fStartHz})`);
  }
  const startTaper = o.startTaperCycles ?? 4;
  const endTaper = o.endTaperCycles ?? 1;
  if (!(startTaper >= 0) || !(endTaper >= 0)) {
    throw new InputError(`taper lengths must be non-negative numbers of cycles (got ${startTaper}, ${endTaper})`);
  }

  const gridStart = o.gridStartTime ?? 0;
  const m = ev.totalMassSeconds;
  const vEnd = Math.min(ev.velocity(fEnd), ev.vIsco);
  const vStart = ev.velocity(o.fStartHz);
  const toIsco = ev.interval(vEnd, ev.vIsco);
  const body = ev.interval(vStart, vEnd);
  // Times relative to the grid start (keeps precision when the time base is ~1e9 s).
  const tEndRel = o.coalescenceTime - gridStart - toIsco.time;
  const tStartRel = tEndRel - body.time;
  const phiEnd = o.coalescencePhase - toIsco.orbitalPhase;
  const phiStart = phiEnd - body.orbitalPhase;
  const xEnd = tEndRel * fs;
  const xStart = tStartRel * fs;
  const iLast = Math.floor(xEnd);
  const iFirst = Math.ceil(xStart);
  const n = Math.max(0, iLast - iFirst + 1);
  const hPlus = new Float64Array(n);
  const hCross = new Float64Array(n);
  const result: TimeDomainWaveform = {
    startIndex: iFirst,
    hPlus,
    hCross,
    sampleRate: fs,
    gridStartTime: gridStart,
    fStartHz: o.fStartHz,
    fEndHz: ev.frequencyHz(vEnd),
    startTime: gridStart + tStartRel,
    endTime: gridStart + tEndRel,
  };
  if (n === 0) return result;

  // Integrate backwards from (vEnd, phiEnd) at xEnd; store v in hPlus and φ in hCross for now.
  const dvdt = ev.dvdt;
  let v = vEnd;
  let phi = phiEnd;
  let stepSamples = xEnd - iLast; // first (fractional) step, in samples
  for (let j = n - 1; j >= 0; j--) {
    const h = -stepSamples / fs;
    if (h !== 0) {
      const g0 = dvdt(v);
      const nSub = Math.max(1, Math.ceil((Math.abs(h) * g0) / (v * MAX_DV_OVER_V)));
      const hs = h / nSub;
      for (let s = 0; s < nSub; s++) {
        // Classical RK4 on (v, φ) with dv/dt = g(v), dφ/dt = v³/M.
        const k1 = s === 0 ? g0 : dvdt(v);
        const p1 = (v * v * v) / m;
        const va = v + 0.5 * hs * k1;
        const k2 = dvdt(va);
        const p2 = (va * va * va) / m;
        const vb = v + 0.5 * hs * k2;
        const k3 = dvdt(vb);
        const p3 = (vb * vb * vb) / m;
        const vc = v + hs * k3;
        const k4 = dvdt(vc);
        const p4 = (vc * vc * vc) / m;
        v += (hs / 6) * (k1 + 2 * k2 + 2 * k3 + k4);
        phi += (hs / 6) * (p1 + 2 * p2 + 2 * p3 + p4);
      }
    }
    hPlus[j] = v;
    hCross[j] = phi;
    stepSamples = 1;
  }

  // Tapers in orbital phase: one GW cycle is π of orbital phase. Keep them within the chirp.
  const span = phiEnd - phiStart;
  const phiTaperStart = Math.min(startTaper * Math.PI, 0.4 * span);
  const phiTaperEnd = Math.min(endTaper * Math.PI, 0.1 * span);
  const distanceMetres = o.distanceMpc * MPC;
  const ci = Math.cos(o.inclination);
  const plusFactor = -(1 + ci * ci);
  const crossFactor = -2 * ci;
  for (let j = 0; j < n; j++) {
    const vj = hPlus[j];
    const pj = hCross[j];
    let w = 1;
    const fromStart = pj - phiStart;
    if (fromStart < phiTaperStart) w *= fromStart <= 0 ? 0 : 0.5 * (1 - Math.cos((Math.PI * fromStart) / phiTaperStart));
    const toEnd = phiEnd - pj;
    if (toEnd < phiTaperEnd) w *= toEnd <= 0 ? 0 : 0.5 * (1 - Math.cos((Math.PI * toEnd) / phiTaperEnd));
    const amp = w * restrictedAmplitude(ev.eta, m, vj, distanceMetres);
    hPlus[j] = plusFactor * amp * Math.cos(2 * pj);
    hCross[j] = crossFactor * amp * Math.sin(2 * pj);
  }
  return result;
}
