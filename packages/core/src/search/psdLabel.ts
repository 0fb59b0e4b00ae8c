import type { PsdMethod } from "./types.js";

/** How a run names where its PSD came from: the noise curve's name, or `welch-AVERAGE-SECONDSs`. */
export function psdLabel(psd: PsdMethod): string {
  return psd.kind === "model" ? psd.model.name : `welch-${psd.average}-${psd.segmentSeconds}s`;
}
