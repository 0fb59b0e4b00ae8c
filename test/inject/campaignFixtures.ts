// Shared set-up for the campaign tests: a narrow BNS population in simulated ajith2011 noise and a
// small dense bank (a stand-in for a 0.97 minimal-match lattice bank over the same masses).
import { ajith2011, type CampaignOptions } from "@chirpsieve/core";
import { chirpMassGrid, standardSearch } from "../search/fixtures.js";

export const FS = 2048;
/** BNS chirps last ~25 s from 40 Hz: short stretches keep the campaigns quick. */
export const FMIN = 40;
export const MASS_RANGE: [number, number] = [1.35, 1.45];

const mc = (m1: number, m2: number) => (m1 * m2) ** 0.6 / (m1 + m2) ** 0.2;

/**
 * Equal-mass templates with chirp mass in 0.1% steps over the population's chirp masses (±0.5%):
 * 82 templates. BNS phase is very sensitive to chirp mass, so it must be sampled finely; the mass
 * ratio matters little over 1.35–1.45 M_sun (η from 0.2487 to 0.25).
 */
export const BNS_BANK = chirpMassGrid(mc(MASS_RANGE[0], MASS_RANGE[0]) * 0.995, mc(MASS_RANGE[1], MASS_RANGE[1]) * 1.005, 0.001, [1]);

/** A campaign of `count` BNS injections at optimal SNR in `snrRange`, threshold `threshold`. */
export function bnsCampaign(count: number, snrRange: [number, number], seed: string, threshold = 7): CampaignOptions {
  return {
    population: { count, massRangeSolar: MASS_RANGE, snrRange, seed },
    data: { kind: "simulated", psd: ajith2011, sampleRate: FS },
    search: standardSearch(BNS_BANK, FMIN, threshold),
  };
}
