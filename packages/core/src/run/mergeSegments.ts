import { InputError } from "../errors.js";
import { clusterByTime } from "../search/cluster.js";
import { addGate } from "../search/gateList.js";
import type { RecordedCandidate, SegmentRecord } from "./shardRecord.js";
import type { Candidate, GateRecord, SkippedStretch } from "../search/types.js";

/** The shape of a run that records are merged into. */
export interface RunLayout {
  /** Per input file, in the run's order: its name (as candidates carry it), segment count and sample rate. */
  readonly inputs: readonly {
    readonly file: string;
    readonly segments: number;
    readonly sampleRate: number;
    /** What the plan left out before any segment (bad data, excluded intervals), and its seconds. */
    readonly skipped?: readonly SkippedStretch[];
    readonly skippedSeconds?: number;
  }[];
  readonly templateCount: number;
  readonly loudestWithinSeconds: number;
}

/** The result of a run put together from segment records: what an unsharded run returns. */
export interface MergedScan {
  /** Per input in order, each clustered across its segments (as searchStrain returns them), concatenated. */
  candidates: Candidate[];
  /** Per input: candidates, segments and searched/skipped seconds (like SearchSummary). */
  perInput: { file: string; candidates: number; segments: number; analysedSeconds: number; skippedSeconds: number; skipped: SkippedStretch[]; gates: GateRecord[] }[];
  segments: number;
  analysedSeconds: number;
  skippedSeconds: number;
  skipped: (SkippedStretch & { file: string })[];
}

function plain(c: RecordedCandidate): Candidate {
  const { sample: _s, peakSnr: _p, ...rest } = c;
  return rest;
}

interface Peak {
  time: number;
  snr: number;
  templateIndex: number;
  index: number;
}

/**
 * Puts a run together from segment records (of shards, or of a journal and a resumed scan) exactly
 * as searchStrain clusters a whole run: per segment, the loudest peak within ±window across the
 * whole bank (re-clustering the union of the records' deciding peaks, in the bank's trigger order,
 * when several records split the bank), then across the segments of each input. The records must
 * cover every segment of every input with templates that tile the bank exactly once (else
 * InputError naming the segment).
 */
export function mergeSegmentRecords(layout: RunLayout, records: Iterable<SegmentRecord>): MergedScan {
  const T = layout.templateCount;
  const w = layout.loudestWithinSeconds;
  const bySegment = new Map<string, SegmentRecord[]>();
  for (const r of records) {
    const key = `${r.input}:${r.segment}`;
    const list = bySegment.get(key);
    if (list) list.push(r);
    else bySegment.set(key, [r]);
  }
  const merged: MergedScan = { candidates: [], perInput: [], segments: 0, analysedSeconds: 0, skippedSeconds: 0, skipped: [] };
  for (const [input, info] of layout.inputs.entries()) {
    const all: Candidate[] = [];
    const skipped: SkippedStretch[] = (info.skipped ?? []).map((k) => ({ ...k }));
    const gates: GateRecord[] = [];
    let analysed = 0;
    let skippedSamples = 0;
    for (let s = 0; s < info.segments; s++) {
      const where = `segment ${s} of ${info.file}`;
      const recs = (bySegment.get(`${input}:${s}`) ?? []).slice().sort((a, b) => a.templates[0] - b.templates[0]);
      let next = 0;
      for (const r of recs) {
        if (r.templates[0] !== next || r.templates[1] < r.templates[0]) {
          const cover = recs.map((q) => q.templates.join("..")).join(", ");
          throw new InputError(
            r.templates[0] > next
              ? `merge: ${where}: templates ${next}..${r.templates[0] - 1} are not covered (records cover ${cover})`
              : `merge: ${where}: templates from ${r.templates[0]} are covered twice (records cover ${cover})`,
          );
        }
        next = r.templates[1] + 1;
      }
      if (next !== T) throw new InputError(`merge: ${where}: templates ${next}..${T - 1} are not covered`);
      const bad = recs.find((r) => r.skipped);
      if (bad) {
        skipped.push({ ...bad.skipped! });
        skippedSamples += bad.searchSamples;
        continue;
      }
      analysed += recs[0].searchSamples;
      // Segments overlap: a transient in the overlap is gated in both, and recorded once (as searchStrain does).
      for (const g of recs[0].gates ?? []) addGate(gates, g);
      if (recs.length === 1) {
        for (const c of recs[0].candidates) all.push(plain(c));
        continue;
      }
      // Union of the deciding peaks, in the order a whole-bank run produces them.
      const peaks = new Map<string, Peak>();
      const details = new Map<string, RecordedCandidate>();
      for (const r of recs) {
        for (const [time, snr, templateIndex, index] of r.peaks ?? []) peaks.set(`${templateIndex}:${index}`, { time, snr, templateIndex, index });
        for (const c of r.candidates) {
          const key = `${c.templateIndex}:${c.sample}`;
          details.set(key, c);
          if (!peaks.has(key)) peaks.set(key, { time: c.coalescenceTime, snr: c.peakSnr, templateIndex: c.templateIndex, index: c.sample });
        }
      }
      const list = [...peaks.values()].sort((a, b) => a.templateIndex - b.templateIndex || a.index - b.index);
      for (const p of clusterByTime(list, w)) {
        const c = details.get(`${p.templateIndex}:${p.index}`);
        // A whole-bank survivor survives its own subset's clustering, so its record has it.
        if (!c) throw new Error(`merge: ${where}: peak of template ${p.templateIndex} at sample ${p.index} has no recorded candidate (inconsistent records)`);
        all.push(plain(c));
      }
    }
    const candidates = clusterByTime(
      all.map((c) => ({ ...c, time: c.coalescenceTime })),
      w,
    ).map(({ time: _t, ...c }) => c as Candidate);
    const fs = info.sampleRate;
    for (const c of candidates) merged.candidates.push(c);
    const skippedSeconds = (info.skippedSeconds ?? 0) + skippedSamples / fs;
    merged.perInput.push({ file: info.file, candidates: candidates.length, segments: info.segments, analysedSeconds: analysed / fs, skippedSeconds, skipped, gates });
    merged.segments += info.segments;
    merged.analysedSeconds += analysed / fs;
    merged.skippedSeconds += skippedSeconds;
    for (const k of skipped) merged.skipped.push({ file: info.file, ...k });
  }
  return merged;
}
