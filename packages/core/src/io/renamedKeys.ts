// Reading records written before some keys gained their units: a previous key stands in for its
// current name when the record lacks the current one. Writers use the current names only.

/** Previous → current names of the solar-mass keys of templates, candidates and injections. */
export const MASS_KEY_RENAMES: Readonly<Record<string, string>> = {
  primaryMass: "primaryMassSolar",
  secondaryMass: "secondaryMassSolar",
  chirpMass: "chirpMassSolar",
  recoveredChirpMass: "recoveredChirpMassSolar",
};

/** Previous → current names of the keys of an injection record (masses in M_sun, distance in Mpc). */
export const INJECTION_KEY_RENAMES: Readonly<Record<string, string>> = {
  ...MASS_KEY_RENAMES,
  distance: "distanceMpc",
};

/** Previous → current names of a bank file's top-level keys (frequencies in Hz, masses in M_sun). */
export const BANK_KEY_RENAMES: Readonly<Record<string, string>> = {
  fmin: "fMinHz",
  fmax: "fMaxHz",
  massRange: "massRangeSolar",
  totalMassCap: "totalMassCapSolar",
};

/**
 * A shallow copy of `record` with every previous key of `renames` moved to its current name; when
 * both are present the current one is kept and the previous one dropped. Anything that is not a
 * plain object is returned unchanged, for the caller's own checks to refuse.
 */
export function withCurrentKeys(record: unknown, renames: Readonly<Record<string, string>>): unknown {
  if (record === null || typeof record !== "object" || Array.isArray(record)) return record;
  const out: Record<string, unknown> = { ...(record as Record<string, unknown>) };
  for (const [previous, current] of Object.entries(renames)) {
    if (!(previous in out)) continue;
    if (!(current in out)) out[current] = out[previous];
    delete out[previous];
  }
  return out;
}
