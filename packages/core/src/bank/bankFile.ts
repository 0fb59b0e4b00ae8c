// Reading and writing template-bank files (JSON).
import { readTextInput } from "../io/readTextInput.js";
import { InputError } from "../errors.js";
import { writeFileAtomic } from "../io/atomicWrite.js";
import { chirpTimesFromComponents } from "./chirpTimeCoordinates.js";
import type { BankGenerator, Template, TemplateBank } from "./templateBank.js";

/**
 * The bank as JSON text:
 *   {"fmin", "matchFloor", "noiseCurve", "massRange": [min, max], optional "totalMassCap",
 *    "massRatioCap", "fmax", "spinRange": [min, max], "generator": {"tool", "version", "arguments"},
 *    "templates": [{"primaryMass", "secondaryMass", "chirpMass", "tau0", "tau3"[, "primarySpin", "secondarySpin"]}, ...]}
 * Masses in solar masses, frequencies in Hz, chirp times (non-spinning) in seconds from fmin, spins
 * dimensionless along the orbital angular momentum (written for every template of a bank with a
 * spinRange, and for any template with a non-zero spin). One template per line.
 */
export function formatBankFile(bank: TemplateBank): string {
  const head: Record<string, unknown> = {
    fmin: bank.fMinHz,
    matchFloor: bank.matchFloor,
    noiseCurve: bank.noiseCurve,
    massRange: bank.massRangeSolar,
  };
  if (bank.totalMassCapSolar !== undefined) head.totalMassCap = bank.totalMassCapSolar;
  if (bank.massRatioCap !== undefined) head.massRatioCap = bank.massRatioCap;
  if (bank.fMaxHz !== undefined) head.fmax = bank.fMaxHz;
  if (bank.spinRange !== undefined) head.spinRange = bank.spinRange;
  if (bank.generator) head.generator = bank.generator;
  const lines = Object.entries(head).map(([k, v]) => `  ${JSON.stringify(k)}: ${JSON.stringify(v)}`);
  const rows = bank.templates.map((t) => {
    const spins = bank.spinRange !== undefined || t.primarySpin || t.secondarySpin ? `, "primarySpin": ${t.primarySpin ?? 0}, "secondarySpin": ${t.secondarySpin ?? 0}` : "";
    return `    {"primaryMass": ${t.primaryMass}, "secondaryMass": ${t.secondaryMass}, "chirpMass": ${t.chirpMass}, "tau0": ${t.tau0}, "tau3": ${t.tau3}${spins}}`;
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
 * 0 < matchFloor < 1, massRange min < max, primaryMass ≥ secondaryMass, and that each template's
 * chirpMass, tau0 and tau3 agree with its masses (relative 1e-6; chirp times from fmin, Sathyaprakash,
 * Phys. Rev. D 50, R7111 (1994)), spins (when present) in (−1, 1) and spinRange [min, max] with
 * −1 < min < max < 1 (spins outside it are refused). Throws InputError "<label>: <what> ..." on the first problem.
 */
export function parseBankFile(text: string, label: string): TemplateBank {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (err) {
    throw new InputError(`${label}: not valid JSON (${(err as Error).message.split("\n")[0]})`);
  }
  if (typeof raw !== "object" || raw === null || Array.isArray(raw)) throw new InputError(`${label}: expected a JSON object with "templates"`);
  const o = raw as Record<string, unknown>;
  const num = (key: string, v: unknown, where = key): number => {
    if (typeof v !== "number" || !Number.isFinite(v)) throw new InputError(`${label}: ${where} must be a number (got ${shown(v)})`);
    return v;
  };
  const positive = (key: string, v: unknown, where = key): number => {
    const x = num(key, v, where);
    if (!(x > 0)) throw new InputError(`${label}: ${where} must be positive (got ${x})`);
    return x;
  };
  for (const key of ["fmin", "matchFloor", "noiseCurve", "massRange", "templates"]) {
    if (!(key in o)) throw new InputError(`${label}: missing "${key}"`);
  }
  const fMinHz = positive("fmin", o.fmin);
  const matchFloor = num("matchFloor", o.matchFloor);
  if (!(matchFloor > 0 && matchFloor < 1)) throw new InputError(`${label}: matchFloor must be strictly between 0 and 1 (got ${matchFloor})`);
  if (typeof o.noiseCurve !== "string" || o.noiseCurve.trim() === "") {
    throw new InputError(`${label}: noiseCurve must be a non-empty string (got ${shown(o.noiseCurve)})`);
  }
  const mr = o.massRange;
  if (!Array.isArray(mr) || mr.length !== 2) throw new InputError(`${label}: massRange must be [min, max] (got ${shown(mr)})`);
  const mMin = positive("massRange", mr[0], "massRange[0]");
  const mMax = positive("massRange", mr[1], "massRange[1]");
  if (!(mMin < mMax)) throw new InputError(`${label}: massRange minimum ${mMin} must be below the maximum ${mMax}`);
  const bank: TemplateBank = { fMinHz, matchFloor, noiseCurve: o.noiseCurve, massRangeSolar: [mMin, mMax], templates: [] };
  if (o.totalMassCap !== undefined) bank.totalMassCapSolar = positive("totalMassCap", o.totalMassCap);
  if (o.massRatioCap !== undefined) {
    const q = num("massRatioCap", o.massRatioCap);
    if (!(q > 1)) throw new InputError(`${label}: massRatioCap must be above 1 (got ${q})`);
    bank.massRatioCap = q;
  }
  if (o.fmax !== undefined) {
    const f = positive("fmax", o.fmax);
    if (!(f > fMinHz)) throw new InputError(`${label}: fmax ${f} must be above fmin ${fMinHz}`);
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
    const e = entry as Record<string, unknown>;
    for (const key of ["primaryMass", "secondaryMass", "chirpMass", "tau0", "tau3"]) {
      if (!(key in e)) throw new InputError(`${label}: ${where} is missing "${key}"`);
    }
    const m1 = positive("", e.primaryMass, `${where}.primaryMass`);
    const m2 = positive("", e.secondaryMass, `${where}.secondaryMass`);
    const mc = positive("", e.chirpMass, `${where}.chirpMass`);
    const t0 = positive("", e.tau0, `${where}.tau0`);
    const t3 = positive("", e.tau3, `${where}.tau3`);
    if (m2 > m1 * (1 + 1e-12)) throw new InputError(`${label}: ${where}: secondaryMass ${m2} exceeds primaryMass ${m1}`);
    const mcExpected = Math.pow(m1 * m2, 0.6) / Math.pow(m1 + m2, 0.2);
    if (!close(mc, mcExpected)) throw new InputError(`${label}: ${where}.chirpMass ${mc} does not match the masses (expected ${mcExpected})`);
    const ct = chirpTimesFromComponents(m1, m2, fMinHz);
    if (!close(t0, ct.tau0)) throw new InputError(`${label}: ${where}.tau0 ${t0} does not match the masses at fmin ${fMinHz} Hz (expected ${ct.tau0})`);
    if (!close(t3, ct.tau3)) throw new InputError(`${label}: ${where}.tau3 ${t3} does not match the masses at fmin ${fMinHz} Hz (expected ${ct.tau3})`);
    const t: Template = { primaryMass: m1, secondaryMass: m2, chirpMass: mc, tau0: t0, tau3: t3 };
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
