import { extname } from "node:path";
import type { Candidate, Coincidence } from "@chirpsieve/core";
import { UsageError } from "./errors.js";
import { parseChoiceFlag } from "./options.js";

/** How candidates are written. */
export type CandidateFormat = "table" | "jsonl" | "csv";

/**
 * --json, --format, else the --out extension (.csv, .txt = table, anything else JSON lines), else
 * a table on a terminal and JSON lines when piped.
 */
export function chooseCandidateFormat(flags: { json?: boolean; format?: string; out?: string }): CandidateFormat {
  if (flags.json && flags.format && flags.format !== "jsonl") throw new UsageError("--json and --format: --json means --format jsonl");
  if (flags.json) return "jsonl";
  if (flags.format) return parseChoiceFlag("--format", flags.format, ["table", "jsonl", "csv"] as const);
  if (flags.out) {
    const ext = extname(flags.out).toLowerCase();
    if (ext === ".csv") return "csv";
    if (ext === ".txt") return "table";
    return "jsonl";
  }
  return process.stdout.isTTY ? "table" : "jsonl";
}

/** Candidates (and, for JSON lines and tables, the run summary) in the chosen format. */
export function renderCandidates(format: CandidateFormat, candidates: Candidate[], summary: Record<string, unknown>): string {
  if (format === "jsonl") {
    return candidates.map((c) => JSON.stringify(candidateRecord(c))).join("\n") + (candidates.length ? "\n" : "") + JSON.stringify(summary) + "\n";
  }
  if (format === "csv") return formatCandidatesCsv(candidates, summary);
  return formatCandidatesTable(candidates, summary);
}

/** Said wherever candidates are reported. */
export const CANDIDATE_CAUTION =
  "A candidate is not a detection: its significance needs a background estimate (e.g. time slides " +
  "between detectors) and data-quality checks that this scan does not provide.";

/** The JSON record of one candidate (field order fixed; documented in the README). */
export function candidateRecord(c: Candidate): Record<string, unknown> {
  return {
    type: "candidate",
    coalescenceTime: round(c.coalescenceTime, 6),
    snr: round(c.snr, 4),
    reweightedSnr: round(c.reweightedSnr, 4),
    chi2: round(c.chi2, 3),
    chi2Dof: c.chi2Dof,
    phase: round(c.phase, 4),
    chirpMassSolar: round(c.chirpMassSolar, 5),
    primaryMassSolar: round(c.primaryMassSolar, 5),
    secondaryMassSolar: round(c.secondaryMassSolar, 5),
    primarySpin: round(c.primarySpin ?? 0, 5),
    secondarySpin: round(c.secondarySpin ?? 0, 5),
    effectiveSpin: round(c.effectiveSpin ?? 0, 5),
    effectiveDistanceMpc: round(c.effectiveDistanceMpc, 3),
    templateIndex: c.templateIndex,
    file: c.file,
  };
}

function round(x: number, digits: number): number {
  if (!Number.isFinite(x)) return x;
  const p = 10 ** digits;
  return Math.round(x * p) / p;
}

const CSV_FIELDS = [
  "coalescenceTime", "snr", "reweightedSnr", "chi2", "chi2Dof", "phase", "chirpMassSolar",
  "primaryMassSolar", "secondaryMassSolar", "primarySpin", "secondarySpin", "effectiveSpin", "effectiveDistanceMpc", "templateIndex", "file",
] as const;

/**
 * CSV with a header row; the file name is quoted; an unavailable effective distance (NaN: the
 * strain's units are not dimensionless strain) is an empty field. With a summary, it follows the
 * rows as a trailer of `# key: value` comment lines (objects and arrays as JSON), one per field,
 * the caution among them.
 */
export function formatCandidatesCsv(candidates: Candidate[], summary?: Record<string, unknown>): string {
  const rows = [CSV_FIELDS.join(",")];
  for (const c of candidates) {
    const r = candidateRecord(c);
    rows.push(CSV_FIELDS.map((f) => csvField(f, r[f])).join(","));
  }
  return rows.join("\n") + "\n" + (summary ? csvSummaryTrailer(summary) : "");
}

function csvField(name: string, value: unknown): string {
  if (name === "file") return JSON.stringify(String(value));
  if (typeof value === "number" && Number.isNaN(value)) return "";
  return String(value);
}

/** The summary as `# key: value` lines (one per field; objects and arrays as one-line JSON). */
export function csvSummaryTrailer(summary: Record<string, unknown>): string {
  const lines = Object.entries(summary).map(([k, v]) => {
    const text = v !== null && typeof v === "object" ? JSON.stringify(v) : String(v);
    return `# ${k}: ${text.replace(/[\r\n]+/g, " ")}`;
  });
  if (!("caution" in summary)) lines.push(`# caution: ${CANDIDATE_CAUTION}`);
  return lines.join("\n") + "\n";
}

/** A table for people, loudest (reweighted) first, with the summary and the caution under it. */
export function formatCandidatesTable(candidates: Candidate[], summary: Record<string, unknown>): string {
  // Spins get columns when some template spins (an aligned-spin bank); χ_eff = (m1 χ1 + m2 χ2)/(m1 + m2).
  const spinning = candidates.some((c) => (c.primarySpin ?? 0) !== 0 || (c.secondarySpin ?? 0) !== 0);
  const head = ["coalescence time (s)", "SNR", "rw SNR", "chi2/dof", "chirp mass", "m1", "m2", ...(spinning ? ["χ1", "χ2", "χ_eff"] : []), "D_eff (Mpc)", "file"];
  const sorted = [...candidates].sort((a, b) => b.reweightedSnr - a.reweightedSnr);
  const rows = sorted.map((c) => [
    c.coalescenceTime.toFixed(4),
    c.snr.toFixed(2),
    c.reweightedSnr.toFixed(2),
    c.chi2Dof > 0 ? `${(c.chi2 / c.chi2Dof).toFixed(2)}` : "-",
    c.chirpMassSolar.toFixed(4),
    c.primaryMassSolar.toFixed(3),
    c.secondaryMassSolar.toFixed(3),
    ...(spinning ? [(c.primarySpin ?? 0).toFixed(3), (c.secondarySpin ?? 0).toFixed(3), (c.effectiveSpin ?? 0).toFixed(3)] : []),
    Number.isNaN(c.effectiveDistanceMpc) ? "—" : c.effectiveDistanceMpc.toFixed(1),
    c.file,
  ]);
  const out: string[] = [];
  out.push(`${candidates.length} candidate(s) with SNR ≥ ${summary.minSnr} (masses in M_sun; chi2/dof of the time-frequency discriminator)`);
  if (rows.length) for (const l of alignedTable(head, rows)) out.push(l);
  out.push("");
  const ofData = summary.dataSeconds === undefined ? "" : ` of ${Number(summary.dataSeconds).toFixed(1)} s`;
  out.push(
    `searched ${Number(summary.analysedSeconds).toFixed(1)} s${ofData} of data in ${summary.files} file(s) with ${summary.templates} templates ` +
      `(${summary.segments} segment${Number(summary.segments) === 1 ? "" : "s"}${summary.sampleRate === null ? ", per stream below" : ` of ${summary.segmentSamples} samples at ${summary.sampleRate} Hz`}; PSD ${summary.psd}; ` +
      `FFT ${summary.fftBackend}) in ${Number(summary.wallSeconds).toFixed(1)} s`,
  );
  if (summary.leadInSeconds !== undefined) {
    const lead = Number(summary.leadInSeconds);
    const tail = Number(summary.tailSeconds);
    out.push(
      `no coalescence time can be searched in the first ${lead.toFixed(1)} s of a file (${(lead - tail).toFixed(1)} s of the longest ` +
        `template before its coalescence plus ${tail.toFixed(1)} s of PSD filter) or in its last ${tail.toFixed(1)} s (PSD filter)`,
    );
  }
  if (Number(summary.skippedSeconds) > 0) {
    const skipped = (summary.skipped as { reason: string }[] | undefined) ?? [];
    const reasons = [...new Set(skipped.map((k) => k.reason))].join("; ");
    out.push(`left out ${Number(summary.skippedSeconds).toFixed(1)} s of data in ${skipped.length} stretch(es) before filtering (${reasons})`);
  }
  if (Number(summary.skippedSeconds) > 0 && summary.lostToEdgesSeconds !== undefined) {
    out.push(`lost ${Number(summary.lostToEdgesSeconds).toFixed(1)} s of valid data to the filter's lead-in and tail at the edges of files and of left-out stretches`);
  }
  const gates = (summary.gates as { time: number; peakSigma: number }[] | undefined) ?? [];
  if (gates.length > 0) {
    const list = gates.slice(0, 5).map((g) => `${g.time.toFixed(3)} s (${g.peakSigma.toFixed(0)} σ)`).join(", ");
    out.push(`gated ${gates.length} loud transient(s) before filtering: ${list}${gates.length > 5 ? ", …" : ""}`);
  }
  const streams = (summary.streams as { file: string; sampleRate: number; segments: number; segmentSamples: number; unsearchable?: string }[] | undefined) ?? [];
  if (streams.length > 1) {
    for (const st of streams) {
      out.push(`  ${st.file}: ${st.unsearchable ? `not searched (${st.unsearchable})` : `${st.segments} segment${st.segments === 1 ? "" : "s"} of ${st.segmentSamples} samples at ${st.sampleRate} Hz`}`);
    }
  }
  const noDistance = summary.distancesUnavailable as { file: string; units: string }[] | undefined;
  for (const n of noDistance ?? []) out.push(`D_eff unavailable for ${n.file}: its units ${JSON.stringify(n.units)} are not dimensionless strain`);
  out.push(CANDIDATE_CAUTION);
  return out.join("\n") + "\n";
}

/** CSV of coincidences: one row each, per-site SNRs in `SITE:snr` columns; the summary trailer as for candidates. */
export function formatCoincidencesCsv(coincidences: Coincidence[], summary?: Record<string, unknown>): string {
  const sites = [...new Set(coincidences.flatMap((c) => Object.keys(c.sites)))];
  const head = ["coalescenceTime", "rankingStatistic", "falseAlarmRatePerYear", "falseAlarmRateIsUpperLimit", "falseAlarmProbability", "chirpMassSolar", "templateIndex", "slides", ...sites.flatMap((s) => [`${s}:snr`, `${s}:reweightedSnr`, `${s}:coalescenceTime`])];
  const rows = [head.join(",")];
  for (const c of coincidences) {
    rows.push([
      c.coalescenceTime.toFixed(6), c.rankingStatistic.toFixed(4), String(c.falseAlarmRatePerYear), String(c.falseAlarmRateIsUpperLimit),
      String(c.falseAlarmProbability), c.chirpMassSolar.toFixed(5), String(c.templateIndex), String(c.slides),
      ...sites.flatMap((s) => {
        const m = c.sites[s];
        return m ? [m.snr.toFixed(4), m.reweightedSnr.toFixed(4), m.coalescenceTime.toFixed(6)] : ["", "", ""];
      }),
    ].join(","));
  }
  return rows.join("\n") + "\n" + (summary ? csvSummaryTrailer(summary) : "");
}

/** A table of coincidences for people, most significant first, with the background livetime. */
export function formatCoincidencesTable(coincidences: Coincidence[], singles: number, summary: Record<string, unknown>): string {
  const bg = summary.background as { slides: number; backgroundSeconds: number; foregroundSeconds: number; falseAlarmRateLimitPerYear: number };
  const sorted = [...coincidences].sort((a, b) => a.falseAlarmRatePerYear - b.falseAlarmRatePerYear || b.rankingStatistic - a.rankingStatistic);
  const head = ["coalescence time (s)", "network rw SNR", "FAR (1/yr)", "FAP", "chirp mass", "site SNRs"];
  const rows = sorted.map((c) => [
    c.coalescenceTime.toFixed(4),
    c.rankingStatistic.toFixed(2),
    `${c.falseAlarmRateIsUpperLimit ? "< " : ""}${c.falseAlarmRatePerYear.toPrecision(3)}`,
    c.falseAlarmProbability.toPrecision(3),
    c.chirpMassSolar.toFixed(4),
    Object.entries(c.sites).map(([n, m]) => `${n} ${m.snr.toFixed(1)}`).join(", "),
  ]);
  const out = [`${coincidences.length} coincidence(s) between sites; ${singles} single-site candidate(s) not in any coincidence (in --json output)`];
  if (rows.length) for (const l of alignedTable(head, rows)) out.push(l);
  out.push("");
  out.push(
    `background: ${bg.slides} time slides, ${bg.backgroundSeconds.toFixed(0)} s of background livetime over ${bg.foregroundSeconds.toFixed(1)} s of coincident data ` +
      `(rates below ${bg.falseAlarmRateLimitPerYear.toPrecision(3)} per year cannot be resolved)`,
  );
  out.push(CANDIDATE_CAUTION);
  return out.join("\n") + "\n";
}

/**
 * The header and rows as lines, columns right-aligned to their widest cell (the last column left as
 * is), two spaces apart. Widths by a running maximum: a spread over 10⁵ rows would overflow the stack.
 */
function alignedTable(head: string[], rows: string[][]): string[] {
  const widths = head.map((h, i) => rows.reduce((w, r) => Math.max(w, r[i].length), h.length));
  const line = (r: string[]) => r.map((v, i) => (i === r.length - 1 ? v : v.padStart(widths[i]))).join("  ");
  const lines = [line(head)];
  for (const r of rows) lines.push(line(r));
  return lines;
}
