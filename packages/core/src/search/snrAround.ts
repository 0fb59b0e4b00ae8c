import { InputError } from "../errors.js";
import { resolveFftBackend } from "../fft/backends.js";
import { chooseSegmentPlan, truncationSeconds, validateSearchOptions } from "./scan.js";
import { createSegmentFilter } from "./segmentFilter.js";
import type { SearchInput, SearchOptions, SearchTemplate } from "./types.js";

/** |z(t)| of one template around a time, and the PSD of the segment it came from. */
export interface SnrAroundTime {
  /** Sample times (s, file time base) of the template's coalescence (peak) positions. */
  times: Float64Array;
  snr: Float64Array;
  /** Frequencies (Hz) and one-sided PSD (1/Hz) of the segment, inside the search band. */
  frequencies: Float64Array;
  psd: Float64Array;
}

/**
 * Re-filters the segment whose searched part holds `centreTime` with one template and returns
 * |z| within ±halfWidthSeconds (clipped to the searched part), for plots of a candidate.
 * Uses the same segment plan, PSD and filter as the search.
 */
export async function snrAroundTime(
  input: SearchInput,
  options: SearchOptions,
  template: SearchTemplate,
  centreTime: number,
  halfWidthSeconds: number,
): Promise<SnrAroundTime> {
  const fs = input.sampleRate;
  validateSearchOptions(options, fs);
  const plan = chooseSegmentPlan(options, fs, input.length);
  const idx = Math.round((centreTime - input.startTime) * fs);
  const seg = plan.segments.find((s) => idx >= s.searchStart && idx < s.searchEnd) ??
    plan.segments.reduce((best, s) => (Math.abs(s.searchStart - idx) < Math.abs(best.searchStart - idx) ? s : best), plan.segments[0]);
  if (!seg) throw new InputError(`${input.file}: no searchable segment`);
  const fMax = Math.min(options.fMaxHz ?? 0.95 * (fs / 2), fs / 2);
  const filter = createSegmentFilter({
    size: plan.size,
    sampleRate: fs,
    fMinHz: options.fMinHz,
    fMaxHz: fMax,
    psd: options.psd,
    truncationSamples: Math.round(truncationSeconds(options) * fs),
    backend: resolveFftBackend(options.fftBackend ?? "auto"),
  });
  try {
    const data = new Float64Array(plan.size);
    const raw = await input.read(seg.start, Math.min(seg.dataLength, input.length - seg.start));
    data.set(raw);
    filter.load(data, raw.length);
    filter.filter(template);
    const half = Math.round(halfWidthSeconds * fs);
    const a = Math.max(seg.searchStart, idx - half) - seg.start;
    const b = Math.min(seg.searchEnd, idx + half) - seg.start;
    const count = Math.max(0, b - a);
    const times = new Float64Array(count);
    const snr = new Float64Array(count);
    const z = filter.snr;
    for (let i = 0; i < count; i++) {
      const j = a + i;
      times[i] = input.startTime + (seg.start + j) / fs;
      snr[i] = Math.hypot(z[2 * j], z[2 * j + 1]);
    }
    const df = fs / plan.size;
    const k0 = Math.max(1, Math.ceil(options.fMinHz / df));
    const k1 = Math.floor(fMax / df);
    const frequencies = new Float64Array(Math.max(0, k1 - k0 + 1));
    const psd = new Float64Array(frequencies.length);
    for (let k = k0; k <= k1; k++) {
      frequencies[k - k0] = k * df;
      psd[k - k0] = filter.psd[k];
    }
    return { times, snr, frequencies, psd };
  } finally {
    filter.dispose();
  }
}
