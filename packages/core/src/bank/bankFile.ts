// Reading and writing template-bank files (JSON).
import { readTextInput } from "../io/readTextInput.js";
import { InputError } from "../errors.js";
import { writeFileAtomic } from "../io/atomicWrite.js";
import { BANK_KEY_RENAMES, MASS_KEY_RENAMES, withCurrentKeys } from "../io/renamedKeys.js";
import { chirpTimesFromComponents } from "./chirpTimeCoordinates.js";
import type { BankGenerator, Template, TemplateBank } from "./templateBank.js";

/**
 * The bank as JSON text:
 *   {"fMinHz", "matchFloor", "noiseCurve", "massRangeSolar": [min, max], optional "totalMassCapSolar",
 *    "massRatioCap", "fMaxHz", "spinRange": [min, max], "generator": {"tool", "version", "arguments"},
 *    "templates": [{"primaryMassSolar", "secondaryMassSolar", "chirpMassSolar", "tau0", "tau3"[, "primarySpin", "secondarySpin"]}, ...]}
 * Masses in solar masses, frequencies in Hz, chirp times (non-spinning) in seconds from fMinHz, spins
 * dimensionless along the orbital angular momentum (written for every template of a bank with a
 * spinRange, and for any template with a non-zero spin). One template per line.
 */
export function formatBankFile(bank: TemplateBank): string {
  const head: Record<string, unknown> = {
    fMinHz: bank.fMinHz,
    matchFloor: bank.matchFloor,
    noiseCurve: bank.noiseCurve,
    massRangeSolar: bank.massRangeSolar,
  };
  if (bank.totalMassCapSolar !== undefined) head.totalMassCapSolar = bank.totalMassCapSolar;
  if (bank.massRatioCap !== undefined) head.massRatioCap = bank.massRatioCap;
  if (bank.fMaxHz !== undefined) head.fMaxHz = bank.fMaxHz;
  if (bank.spinRange !== undefined) head.spinRange = bank.spinRange;
  if (bank.generator) head.generator = bank.generator;
  const lines = Object.entries(head).map(([k, v]) => `  ${JSON.stringify(k)}: ${JSON.stringify(v)}`);
  const rows = bank.templates.map((t) => {
    const spins = bank.spinRange !== undefined || t.primarySpin || t.secondarySpin ? `, "primarySpin": ${t.primarySpin ?? 0}, "secondarySpin": ${t.secondarySpin ?? 0}` : "";
    return `    {"primaryMassSolar": ${t.primaryMassSolar}, "secondaryMassSolar": ${t.secondaryMassSolar}, "chirpMassSolar": ${t.chirpMassSolar}, "tau0": ${t.tau0}, "tau3": ${t.tau3}${spins}}`;
  });
  return `{\n${lines.join(",\n")},\n  "templates": [\n${rows.join(",\n")}\n  ]\n}\n`;
}

/** Writes the bank to `path` atomically (a reader never sees a partial file). */
export function writeBankFile(path: string, bank: TemplateBank): void {
  writeFileAtomic(path, formatBankFile(bank));
}

/** Reads and validates a bank file; errors name the file and the entry. */
export function readBankFile(path: string): TemplateBank {
  const text = readTextInput(path, "bank file");
  return parseBankFile(text, path);
}

function shown(v: unknown): string {
  return typeof v === "string" ? JSON.stringify(v) : (JSON.stringify(v) ?? String(v));
}

/**
 * Parses bank JSON (see {@link formatBankFile}). Checks every field: positive finite numbers,
 * 0 < matchFloor < 1, massRangeSolar min < max, primaryMassSolar ≥ secondaryMassSolar, and that each template's
 * chirpMassSolar, tau0 and tau3 agree with its masses (relative 1e-6; chirp times from fMinHz, Sathyaprakash,
 * Phys. Rev. D 50, R7111 (1994)), spins (when present) in (−1, 1) and spinRange [min, max] with
 * −1 < min < max < 1 (spins outside it are refused). Throws InputError "<label>: <what> ..." on the first problem.
 * Files written before the keys carried their units (fmin, fmax, massRange, totalMassCap; primaryMass,
 * secondaryMass, chirpMass in templates) are read too ({@link withCurrentKeys}).
 */
export function parseBankFile(text: string, label: string): TemplateBank {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (err) {
    throw new InputError(`${label}: not valid JSON (${(err as Error).message.split("\n")[0]})`);
  }
  if (typeof raw !== "object" || raw === null || Array.isArray(raw)) throw new InputError(`${label}: expected a JSON object with "templates"`);
  const o = withCurrentKeys(raw, BANK_KEY_RENAMES) as Record<string, unknown>;
  const num = (key: string, v: unknown, where = key): number => {
    if (typeof v !== "number" || !Number.isFinite(v)) throw new InputError(`${label}: ${where} must be a number (got ${shown(v)})`);
    return v;
  };
  const positive = (key: string, v: unknown, where = key): number => {
    const x = num(key, v, where);
    if (!(x > 0)) throw new InputError(`${label}: ${where} must be positive (got ${x})`);
    return x;
  };
  for (const key of ["fMinHz", "matchFloor", "noiseCurve", "massRangeSolar", "templates"]) {
    if (!(key in o)) throw new InputError(`${label}: missing "${key}"`);
  }
  const fMinHz = positive("fMinHz", o.fMinHz);
  const matchFloor = num("matchFloor", o.matchFloor);
  if (!(matchFloor > 0 && matchFloor < 1)) throw new InputError(`${label}: matchFloor must be strictly between 0 and 1 (got ${matchFloor})`);
  if (typeof o.noiseCurve !== "string" || o.noiseCurve.trim() === "") {
    throw new InputError(`${label}: noiseCurve must be a non-empty string (got ${shown(o.noiseCurve)})`);
  }
  const mr = o.massRangeSolar;
  if (!Array.isArray(mr) || mr.length !== 2) throw new InputError(`${label}: massRangeSolar must be [min, max] (got ${shown(mr)})`);
  const mMin = positive("massRangeSolar", mr[0], "massRangeSolar[0]");
  const mMax = positive("massRangeSolar", mr[1], "massRangeSolar[1]");
  if (!(mMin < mMax)) throw new InputError(`${label}: massRangeSolar minimum ${mMin} must be below the maximum ${mMax}`);
  const bank: TemplateBank = { fMinHz, matchFloor, noiseCurve: o.noiseCurve, massRangeSolar: [mMin, mMax], templates: [] };
  if (o.totalMassCapSolar !== undefined) bank.totalMassCapSolar = positive("totalMassCapSolar", o.totalMassCapSolar);
  if (o.massRatioCap !== undefined) {
    const q = num("massRatioCap", o.massRatioCap);
    if (!(q > 1)) throw new InputError(`${label}: massRatioCap must be above 1 (got ${q})`);
    bank.massRatioCap = q;
  }
  if (o.fMaxHz !== undefined) {
    const f = positive("fMaxHz", o.fMaxHz);
    if (!(f > fMinHz)) throw new InputError(`${label}: fMaxHz ${f} must be above fMinHz ${fMinHz}`);
    bank.fMaxHz = f;
  }
  if (o.spinRange !== undefined) {
    const sr = o.spinRange;
    if (!Array.isArray(sr) || sr.length !== 2) throw new InputError(`${label}: spinRange must be [min, max] (got ${shown(sr)})`);
    const lo = num("spinRange", sr[0], "spinRange[0]");
    const hi = num("spinRange", sr[1], "spinRange[1]");
    if (!(lo > -1 && hi < 1 && lo < hi)) throw new InputError(`${label}: spinRange must satisfy −1 < min < max < 1 (got ${shown(sr)})`);
    bank.spinRange = [lo, hi];
  }
  if (o.generator !== undefined) {
    const g = o.generator as Partial<BankGenerator> | null;
    if (typeof g !== "object" || g === null || typeof g.tool !== "string" || typeof g.version !== "string" || !Array.isArray(g.arguments)) {
      throw new InputError(`${label}: generator must be {"tool", "version", "arguments": [...]}`);
    }
    bank.generator = { tool: "chirpsieve", version: g.version, arguments: g.arguments.map(String) };
  }
  if (!Array.isArray(o.templates)) throw new InputError(`${label}: templates must be an array`);
  if (o.templates.length === 0) throw new InputError(`${label}: templates is empty`);
  const close = (a: number, b: number): boolean => Math.abs(a - b) <= 1e-6 * Math.abs(b);
  o.templates.forEach((entry: unknown, i: number) => {
    const where = `templates[${i}]`;
    if (typeof entry !== "object" || entry === null) throw new InputError(`${label}: ${where} must be an object`);
    const e = withCurrentKeys(entry, MASS_KEY_RENAMES) as Record<string, unknown>;
    for (const key of ["primaryMassSolar", "secondaryMassSolar", "chirpMassSolar", "tau0", "tau3"]) {
      if (!(key in e)) throw new InputError(`${label}: ${where} is missing "${key}"`);
    }
    const m1 = positive("", e.primaryMassSolar, `${where}.primaryMassSolar`);
    const m2 = positive("", e.secondaryMassSolar, `${where}.secondaryMassSolar`);
    const mc = positive("", e.chirpMassSolar, `${where}.chirpMassSolar`);
    const t0 = positive("", e.tau0, `${where}.tau0`);
    const t3 = positive("", e.tau3, `${where}.tau3`);
    if (m2 > m1 * (1 + 1e-12)) throw new InputError(`${label}: ${where}: secondaryMassSolar ${m2} exceeds primaryMassSolar ${m1}`);
    const mcExpected = Math.pow(m1 * m2, 0.6) / Math.pow(m1 + m2, 0.2);
    if (!close(mc, mcExpected)) throw new InputError(`${label}: ${where}.chirpMassSolar ${mc} does not match the masses (expected ${mcExpected})`);
    const ct = chirpTimesFromComponents(m1, m2, fMinHz);
    if (!close(t0, ct.tau0)) throw new InputError(`${label}: ${where}.tau0 ${t0} does not match the masses from fMinHz = ${fMinHz} Hz (expected ${ct.tau0})`);
    if (!close(t3, ct.tau3)) throw new InputError(`${label}: ${where}.tau3 ${t3} does not match the masses from fMinHz = ${fMinHz} Hz (expected ${ct.tau3})`);
    const t: Template = { primaryMassSolar: m1, secondaryMassSolar: m2, chirpMassSolar: mc, tau0: t0, tau3: t3 };
    if ("primarySpin" in e || "secondarySpin" in e) {
      const spin = (key: "primarySpin" | "secondarySpin"): number => {
        const x = num("", e[key] ?? 0, `${where}.${key}`);
        if (!(Math.abs(x) < 1)) throw new InputError(`${label}: ${where}.${key} must lie strictly between −1 and 1 (got ${x})`);
        const r = bank.spinRange;
        if (r && !(x >= r[0] - 1e-12 && x <= r[1] + 1e-12)) {
          throw new InputError(`${label}: ${where}.${key} ${x} lies outside spinRange [${r[0]}, ${r[1]}]`);
        }
        return x;
      };
      t.primarySpin = spin("primarySpin");
      t.secondarySpin = spin("secondarySpin");
    }
    bank.templates.push(t);
  });
  return bank;
}
