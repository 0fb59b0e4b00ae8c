import { readTextInput } from "../io/readTextInput.js";
import { InputError } from "../errors.js";
import { writeFileAtomic } from "../io/atomicWrite.js";
import { type Injection, type InjectionRecord, checkInjection, injectionRecord } from "./injection.js";

/**
 * The JSON description of a simulated series and what was injected into it (chirpsieve's own
 * format). `synthetic` is always true: these files describe simulated data only.
 */
export interface InjectionManifest {
  synthetic: true;
  /** Name of the noise curve the noise was drawn from (and the SNRs computed with). */
  noiseCurve: string;
  /** False when the series holds the injections only (no noise added). */
  noise: boolean;
  sampleRate: number;
  startTime: number;
  duration: number;
  /** Lowest GW frequency (Hz) of the injected chirps and of the SNR integral. */
  fMinHz: number;
  seed: string | number;
  /** Name of the (invented) detector the signals were projected onto. */
  detector: string;
  /**
   * When the injections spin: the range each aligned spin χ was drawn from, uniformly and
   * independently for the two bodies (absent for non-spinning injections).
   */
  spinRange?: [number, number];
  /** One record per injection (injection.ts injectionRecord). */
  injections: InjectionRecord[];
}

/** Builds a manifest; every injection needs its optimalSnr (NaN is written as null otherwise). */
export function injectionManifest(
  meta: Omit<InjectionManifest, "synthetic" | "injections">,
  injections: (Injection & { networkOptimalSnr?: number })[],
): InjectionManifest {
  return {
    synthetic: true,
    noiseCurve: meta.noiseCurve,
    noise: meta.noise,
    sampleRate: meta.sampleRate,
    startTime: meta.startTime,
    duration: meta.duration,
    fMinHz: meta.fMinHz,
    seed: meta.seed,
    detector: meta.detector,
    ...(meta.spinRange ? { spinRange: meta.spinRange } : {}),
    injections: injections.map(injectionRecord),
  };
}

/** The manifest as pretty-printed JSON text (one injection per line), ending in a newline. */
export function formatInjectionManifest(manifest: InjectionManifest): string {
  const { injections, ...head } = manifest;
  const headText = JSON.stringify(head, null, 2).replace(/\n}$/, "");
  const lines = injections.map((inj) => `    ${JSON.stringify(inj)}`);
  const list = lines.length === 0 ? "[]" : `[\n${lines.join(",\n")}\n  ]`;
  return `${headText},\n  "injections": ${list}\n}\n`;
}

/** Writes a manifest atomically (temporary file, then rename). */
export function writeInjectionManifest(path: string, manifest: InjectionManifest): void {
  writeFileAtomic(path, formatInjectionManifest(manifest));
}

/**
 * Parses injections from JSON text: either an array of injection records or an object with an
 * "injections" array (such as a manifest). Every record is validated; errors name `fileName` and
 * the entry index. Extra fields (chirpMassSolar, optimalSnr, …) are accepted; optimalSnr is kept. Manifests
 * written before the masses and distance carried their unit (primaryMass, secondaryMass, chirpMass, distance) are read too.
 */
export function parseInjections(text: string, fileName: string): Injection[] {
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch (err) {
    throw new InputError(`${fileName}: not valid JSON (${(err as Error).message.split("\n")[0]})`);
  }
  const list = Array.isArray(value)
    ? value
    : value !== null && typeof value === "object" && Array.isArray((value as { injections?: unknown }).injections)
      ? ((value as { injections: unknown[] }).injections)
      : undefined;
  if (!list) throw new InputError(`${fileName}: expected an array of injections or an object with an "injections" array`);
  return list.map((entry, i) => checkInjection(entry, `${fileName}: injection ${i}`));
}

/** Reads and validates an injection file (see {@link parseInjections}). */
export function readInjectionFile(path: string): Injection[] {
  return parseInjections(readTextInput(path, "injection file"), path);
}
