// Decide rows vs lattices: group patches into runs along τ0 and choose, per run and per patch, the cheaper cover.
import type { LatticePoint, PatchBox } from "./patch.js";

/**
 * Runs of neighbouring patches: in order of (tau0Lo, etaLo), each run extended by the next unused patch
 * that starts where its last one ends (tau0Lo = tau0Hi) with the same η-range. Indices into `patches`.
 */
export function patchRuns(patches: readonly PatchBox[]): number[][] {
  const order = patches.map((_, i) => i).sort((p, q) => patches[p].tau0Lo - patches[q].tau0Lo || patches[p].etaLo - patches[q].etaLo);
  const done = new Set<number>();
  const runs: number[][] = [];
  for (const first of order) {
    if (done.has(first)) continue;
    done.add(first);
    const run = [first];
    for (;;) {
      const tail = patches[run[run.length - 1]];
      const next = order.find((i) => !done.has(i) && patches[i].tau0Lo === tail.tau0Hi && patches[i].etaLo === tail.etaLo && patches[i].etaHi === tail.etaHi);
      if (next === undefined) break;
      done.add(next);
      run.push(next);
    }
    runs.push(run);
  }
  return runs;
}

/** The patches in order of (tau0Lo, etaLo), each alone: the runs when rows are not wanted. */
export function singlePatchRuns(patches: readonly PatchBox[]): number[][] {
  return patches
    .map((_, i) => i)
    .sort((p, q) => patches[p].tau0Lo - patches[q].tau0Lo || patches[p].etaLo - patches[q].etaLo)
    .map((i) => [i]);
}

/**
 * Rows along the band of a run of patches (indices), or null where they cannot be laid; `clearEnds`
 * false lays them without the clearance at the run's τ0-sides (for comparing counts only).
 */
export type LayRows = (run: number[], clearEnds: boolean) => LatticePoint[] | null;

/**
 * The cover of one run, as the lists of points to keep, in order. The run takes its rows (laid with
 * `layRows(run, true)`) when they are fewer than its lattices' points and every inner patch's share of
 * them (templates by τ0, against the patches' τ0 sides) is smaller than its own lattice; the end
 * patches' shares hold the ends' clearance, which any run pays. Otherwise each patch decides alone
 * (rows laid without the clearance, against its lattice), and each stretch of neighbours that take
 * rows is laid again as a run (with the clearance), keeping its lattices if those rows are not fewer.
 * Our rule, no source. Pure given `layRows`.
 */
export function chooseRunCover(run: number[], patches: readonly PatchBox[], lattices: readonly LatticePoint[][], layRows: LayRows): LatticePoint[][] {
  const latticeCount = (ids: number[]): number => ids.reduce((sum, i) => sum + lattices[i].length, 0);
  const rows = layRows(run, true);
  if (rows !== null && rows.length < latticeCount(run)) {
    const share = new Array<number>(run.length).fill(0);
    for (const p of rows) {
      let k = 0;
      while (k < run.length - 1 && p.tau0 >= patches[run[k]].tau0Hi) k++;
      share[k]++;
    }
    if (run.every((i, k) => k === 0 || k === run.length - 1 || share[k] < lattices[i].length)) return [rows];
  }
  if (run.length === 1) return [lattices[run[0]]];
  const out: LatticePoint[][] = [];
  let piece: number[] = [];
  const flush = (): void => {
    if (piece.length === 0) return;
    const again = layRows(piece, true);
    if (again !== null && again.length < latticeCount(piece)) out.push(again);
    else for (const i of piece) out.push(lattices[i]);
    piece = [];
  };
  for (const i of run) {
    const alone = layRows([i], false);
    if (alone !== null && alone.length < lattices[i].length) piece.push(i);
    else {
      flush();
      out.push(lattices[i]);
    }
  }
  flush();
  return out;
}
