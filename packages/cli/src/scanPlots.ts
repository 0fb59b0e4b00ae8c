import * as Plot from "@observablehq/plot";
import { join } from "node:path";
import {
  snrAroundTime,
  templateIscoTimeOffset,
  writeFileAtomic,
  type Candidate,
  type SearchInput,
  type SearchOptions,
} from "@chirpsieve/core";
import { renderSvg } from "./plot.js";
import { GUIDE_DASH, INK, asdAxis } from "./plotStyle.js";

/** How many of the loudest candidates get an SNR plot. */
const PLOTTED = 5;

/**
 * Writes `snr-<n>.svg` (|z| of the candidate's template against time around it) for the loudest
 * candidates, and `psd-<file>.svg` (the PSD of the segment holding the loudest candidate of each
 * file, or of the first segment when a file has none).
 */
export async function writeScanPlots(
  dir: string,
  files: string[],
  candidates: Candidate[],
  options: SearchOptions & { open: (file: string) => Promise<SearchInput & { close(): Promise<void> }> },
): Promise<string[]> {
  const written: string[] = [];
  const loudest = [...candidates].sort((a, b) => b.snr - a.snr).slice(0, PLOTTED);
  const psdDone = new Set<string>();
  for (const [rank, c] of loudest.entries()) {
    const input = await options.open(c.file);
    try {
      const template = options.templates[c.templateIndex];
      // snrAroundTime works in the template's peak times; the candidate's time is when the template
      // reaches its ISCO, a fixed offset later.
      const offset = templateIscoTimeOffset(template.primaryMassSolar, template.secondaryMassSolar, options.fMinHz);
      const r = await snrAroundTime(input, options, template, c.coalescenceTime - offset, 2);
      const points = Array.from(r.times, (t, i) => ({ t: t + offset - c.coalescenceTime, snr: r.snr[i] }));
      const svg = renderSvg({
        width: 720,
        height: 320,
        marginLeft: 50,
        x: { label: `time − ${c.coalescenceTime.toFixed(3)} s` },
        y: { label: "SNR |z|", grid: true },
        marks: [
          Plot.line(points, { x: "t", y: "snr", stroke: INK.main }),
          Plot.ruleY([options.snrThreshold], { stroke: INK.guide, strokeDasharray: GUIDE_DASH }),
          Plot.text([{ t: 0, snr: c.snr }], { x: "t", y: "snr", text: () => `SNR ${c.snr.toFixed(1)}, Mc ${c.chirpMassSolar.toFixed(3)} M☉ (candidate)`, dy: -8 }),
        ],
      });
      const name = join(dir, `snr-${rank + 1}.svg`);
      writeFileAtomic(name, svg);
      written.push(name);
      if (!psdDone.has(c.file)) {
        psdDone.add(c.file);
        written.push(writePsdPlot(dir, c.file, r.frequencies, r.psd));
      }
    } finally {
      await input.close();
    }
  }
  for (const f of files) {
    if (psdDone.has(f)) continue;
    const input = await options.open(f);
    try {
      const r = await snrAroundTime(input, options, options.templates[0], input.startTime, 0);
      written.push(writePsdPlot(dir, f, r.frequencies, r.psd));
    } finally {
      await input.close();
    }
  }
  return written;
}

/** SVG log–log plot of the amplitude spectral density √S(f) a segment was filtered with. */
export function renderSegmentAsdPlot(frequencies: Float64Array, psd: Float64Array): string {
  const stride = Math.max(1, Math.floor(frequencies.length / 4000));
  const points: { f: number; asd: number }[] = [];
  for (let i = 0; i < frequencies.length; i += stride) points.push({ f: frequencies[i], asd: Math.sqrt(psd[i]) });
  return renderSvg({
    width: 720,
    height: 360,
    marginLeft: 70,
    x: { type: "log", label: "frequency (Hz)" },
    y: asdAxis(),
    marks: [Plot.line(points, { x: "f", y: "asd", stroke: INK.main })],
  });
}

function writePsdPlot(dir: string, file: string, frequencies: Float64Array, psd: Float64Array): string {
  const svg = renderSegmentAsdPlot(frequencies, psd);
  const base = file.replace(/^.*[\\/]/, "").replace(/[^A-Za-z0-9._-]/g, "_");
  const name = join(dir, `psd-${base}.svg`);
  writeFileAtomic(name, svg);
  return name;
}
