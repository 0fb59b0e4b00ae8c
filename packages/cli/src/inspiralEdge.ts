import { ajith2011, inspiralEdgeOfBank, type InspiralEdge, type PsdModel, type ShareTemplate } from "@chirpsieve/core";

/** Share of a template's SNR the inspiral to the ISCO must carry before we warn (ours: a template missing more than a tenth of its signal's SNR is no longer a faithful model of it). */
export const INSPIRAL_SHARE_FLOOR = 0.9;

/** What a summary records about the edge of the inspiral. */
export interface InspiralEdgeRecord extends InspiralEdge {
  /** Noise curve the shares were computed with. */
  psd: string;
}

/**
 * Computes the inspiral share of every template ({@link inspiralEdgeOfBank}) against
 * {@link INSPIRAL_SHARE_FLOOR}. Without a noise curve (a PSD estimated from the data) the ajith2011
 * design curve stands in. {@link warnInspiralEdge} prints the warning once the work has succeeded.
 */
export function checkInspiralEdge(templates: readonly ShareTemplate[], psd: PsdModel | undefined, fMinHz: number): InspiralEdgeRecord {
  const curve = psd ?? ajith2011;
  const edge = inspiralEdgeOfBank(templates, curve, fMinHz, {
    threshold: INSPIRAL_SHARE_FLOOR,
    fMaxHz: curve.fMaxHz,
  });
  return { ...edge, psd: psd ? curve.name : `${curve.name} (design curve standing in for the estimated PSD)` };
}

/** One warning line on stderr naming the total-mass range of the templates below the floor (none if all are above). */
export function warnInspiralEdge(record: InspiralEdgeRecord): void {
  if (record.below > 0) {
    const [lo, hi] = record.totalMassRangeSolar!;
    process.stderr.write(
      `chirpsieve: warning: ${record.below} of ${record.templates} templates (total mass ${lo.toFixed(1)}–${hi.toFixed(1)} M_sun) ` +
        `carry less than ${Math.round(100 * INSPIRAL_SHARE_FLOOR)}% of their signal's SNR in the inspiral to the ISCO ` +
        `(lowest ${Math.round(100 * record.lowestShare)}%, ${record.psd}); merger and ringdown are not modelled, so binaries from ` +
        `${lo.toFixed(1)} M_sun total mass up are found with lighter chirp masses and earlier times than they have\n`,
    );
  }
}
