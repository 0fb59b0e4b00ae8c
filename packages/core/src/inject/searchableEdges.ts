import { checkComponentMassRange } from "../physics/massDomain.js";
import { InputError } from "../errors.js";
import { templateDurationSeconds } from "../search/templateTiming.js";

/** Cushion (s) added at both ends: the Earth-centre-to-detector delay (≤ 21.4 ms) and sample rounding. */
const EDGE_CUSHION_SECONDS = 0.1;

/**
 * The start and end of a series where a scan from fMinHz cannot search coalescence times, for a
 * bank over massRangeSolar: the longest template (the lightest equal-mass binary, from fMinHz to
 * its ISCO; search/templateTiming.ts) plus the inverse-PSD filter of filterSeconds at the start,
 * the filter at the end, each plus 0.1 s (the Earth-centre delay and rounding). Random injections
 * kept clear of these can all be searched.
 */
export function unsearchableEdges(
  massRangeSolar: [number, number],
  fMinHz: number,
  filterSeconds: number,
): { leadInSeconds: number; tailSeconds: number } {
  checkComponentMassRange(massRangeSolar);
  const lightest = massRangeSolar[0];
  if (!(lightest > 0) || !(fMinHz > 0) || !(filterSeconds >= 0)) {
    throw new InputError(`unsearchable edges need positive masses and fMin and a non-negative filter length (got ${lightest}, ${fMinHz}, ${filterSeconds})`);
  }
  const longest = templateDurationSeconds(lightest, lightest, fMinHz);
  return { leadInSeconds: longest + filterSeconds + EDGE_CUSHION_SECONDS, tailSeconds: filterSeconds + EDGE_CUSHION_SECONDS };
}
