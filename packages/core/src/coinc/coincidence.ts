import { clusterByTime } from "../search/cluster.js";

/**
 * One site's triggers as the coincidence engine sees them, in time order: `times` ascending
 * (s, any common origin), and per trigger the ranking value (reweighted SNR), template index and
 * chirp mass. `index` maps position → caller's trigger index (the engine reports that index).
 */
export interface SiteTriggerArrays {
  times: Float64Array;
  index: Int32Array;
  /** Per caller index: reweighted SNR, template index, chirp mass (M_sun). */
  rank: Float64Array;
  template: Int32Array;
  chirpMassSolar: Float64Array;
}

/** What makes two triggers at two sites coincident. */
export interface CoincidenceRule {
  /**
   * Row-major N×N: the largest |t_a − t_b| (s) for sites a and b, i.e. the light-travel time
   * between them plus the timing tolerance.
   */
  windows: Float64Array;
  /**
   * Relative chirp-mass tolerance: triggers of different templates are compatible when
   * |M_a − M_b| ≤ tolerance · (M_a + M_b) / 2 (0: the same template only).
   */
  chirpMassTolerance: number;
}

/** A coincidence found by {@link formCoincidences}. */
export interface RawCoincidence {
  /** Time (in the engine's time origin) of the member at the lowest site position. */
  time: number;
  /** Network reweighted SNR √(Σ ρ̂²) of the members (named `snr` for {@link clusterByTime}). */
  snr: number;
  /** Per site position: the caller's trigger index, or −1 when the site takes no part. */
  members: Int32Array;
}

/** Whether two triggers may come from the same template (see {@link CoincidenceRule}). */
function sameSource(a: SiteTriggerArrays, i: number, b: SiteTriggerArrays, j: number, tol: number): boolean {
  if (a.template[i] === b.template[j]) return true;
  if (tol <= 0) return false;
  const ma = a.chirpMassSolar[i];
  const mb = b.chirpMassSolar[j];
  return Math.abs(ma - mb) <= 0.5 * tol * (ma + mb);
}

/**
 * Forms every coincidence of two or more sites, at most one trigger per site, in which every pair
 * of members is within its site pair's window and template-compatible, then keeps the loudest
 * (by network reweighted SNR ρ_net = √(Σ ρ̂_i²), the quadrature sum of the members' reweighted
 * SNRs; common practice, no source) within ± `loudestWithinSeconds` of the time of its lowest-site
 * member (via {@link clusterByTime}). Each combination is enumerated once, anchored on its member
 * at the lowest site position and extended through the later sites in order.
 * Cost: linear in the triggers (a forward-moving pointer per site) plus the matches found.
 */
export function formCoincidences(sites: readonly SiteTriggerArrays[], rule: CoincidenceRule, loudestWithinSeconds: number): RawCoincidence[] {
  const n = sites.length;
  const found: RawCoincidence[] = [];
  const chosenSite = new Int32Array(n);
  const chosenPos = new Int32Array(n);
  const first = new Int32Array(n);
  const tol = rule.chirpMassTolerance;
  const win = rule.windows;
  let depth = 0;

  const emit = (): void => {
    const members = new Int32Array(n).fill(-1);
    let sum = 0;
    for (let d = 0; d < depth; d++) {
      const s = sites[chosenSite[d]];
      const idx = s.index[chosenPos[d]];
      members[chosenSite[d]] = idx;
      sum += s.rank[idx] * s.rank[idx];
    }
    found.push({ time: sites[chosenSite[0]].times[chosenPos[0]], snr: Math.sqrt(sum), members });
  };

  const extend = (from: number): void => {
    const a0 = chosenSite[0];
    const t0 = sites[a0].times[chosenPos[0]];
    for (let c = from; c < n; c++) {
      const sc = sites[c];
      const w0 = win[a0 * n + c];
      const times = sc.times;
      // Anchors come in ascending time, so the first candidate position only moves forward.
      const tStart = t0 - w0;
      let lo = first[c];
      while (lo < times.length && times[lo] < tStart) lo++;
      first[c] = lo;
      for (let j = lo; j < times.length && times[j] <= t0 + w0; j++) {
        const jIdx = sc.index[j];
        let ok = true;
        for (let d = 0; d < depth && ok; d++) {
          const sd = sites[chosenSite[d]];
          const p = chosenPos[d];
          if (Math.abs(sd.times[p] - times[j]) > win[chosenSite[d] * n + c]) ok = false;
          else if (!sameSource(sd, sd.index[p], sc, jIdx, tol)) ok = false;
        }
        if (!ok) continue;
        chosenSite[depth] = c;
        chosenPos[depth] = j;
        depth++;
        emit();
        extend(c + 1);
        depth--;
      }
    }
  };

  for (let a = 0; a < n - 1; a++) {
    const len = sites[a].times.length;
    first.fill(0);
    for (let i = 0; i < len; i++) {
      chosenSite[0] = a;
      chosenPos[0] = i;
      depth = 1;
      extend(a + 1);
    }
  }
  return clusterByTime(found, loudestWithinSeconds);
}
