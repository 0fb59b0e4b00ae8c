// The self-contained HTML report of a `recover` campaign: inline SVG plots (Observable Plot via
// renderSvg), summary and worst-miss tables. No scripts, fonts, images or links to fetch.
import * as Plot from "@observablehq/plot";
import { gaussianDetectionProbability } from "@chirpsieve/core";
import { renderSvg } from "./plot.js";
import { FOUND_MARK, FOUND_WORDS, GUIDE_DASH, INK, MISSED_MARK, MISSED_WORDS, POINT_MARK } from "./plotStyle.js";
import type { CampaignDocument } from "./reportData.js";

/** Names of the plots the report always contains (each a <figure data-plot="NAME"> with one <svg>). */
export const REPORT_PLOTS = [
  "efficiency-snr",
  "efficiency-distance",
  "found-missed",
  "snr-recovery",
  "chirp-mass-error",
  "time-error",
] as const;

/** How many missed injections the worst-miss table lists. */
const WORST_MISSES = 15;

function esc(text: string): string {
  return text.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

function figure(name: string, svg: string, caption: string): string {
  return `<figure class="plot" data-plot="${name}">${svg}<figcaption>${esc(caption)}</figcaption></figure>`;
}

const WIDTH = 640;
const HEIGHT = 340;

function noData(label: string): string {
  return renderSvg({ width: WIDTH, height: 120, x: { axis: null }, y: { axis: null }, marks: [Plot.text([label], { frameAnchor: "middle", fontSize: 14 })] });
}

interface BinPoint {
  x: number;
  low: number;
  high: number;
  e: number;
  lo: number;
  hi: number;
  n: number;
}

function efficiencyPlot(points: BinPoint[], xLabel: string, extra: Plot.Markish[] = []): string {
  if (points.length === 0) return noData("no injections");
  return renderSvg({
    width: WIDTH,
    height: HEIGHT,
    marginLeft: 50,
    x: { label: xLabel, grid: true },
    y: { label: "efficiency (found fraction)", domain: [0, 1.05], grid: true },
    marks: [
      ...extra,
      Plot.ruleX(points, { x: "x", y1: "lo", y2: "hi", stroke: INK.main }),
      Plot.ruleY(points, { y: "e", x1: "low", x2: "high", stroke: INK.main, strokeOpacity: 0.5 }),
      Plot.dot(points, { x: "x", y: "e", ...POINT_MARK, title: (d: BinPoint) => `${d.n} injections` }),
      Plot.ruleY([0.5], { stroke: INK.guide, strokeDasharray: GUIDE_DASH }),
    ],
  });
}

/** Renders the campaign report as one HTML page (a string). */
export function renderCampaignReport(doc: CampaignDocument): string {
  const s = doc.summary;
  const p = doc.population;
  const threshold = Number(doc.arguments.minSnr ?? NaN);
  const injections = doc.injections;
  const found = injections.filter((o) => o.found);
  const figures: string[] = [];

  // 1. Efficiency against optimal SNR, with the Gaussian-noise expectation for the threshold.
  const snrPoints: BinPoint[] = s.efficiencyBySnr
    .filter((b) => b.total > 0)
    .map((b) => ({ x: (b.snrLow + b.snrHigh) / 2, low: b.snrLow, high: b.snrHigh, e: b.efficiency!, lo: b.lower!, hi: b.upper!, n: b.total }));
  const extra: Plot.Markish[] = [];
  if (snrPoints.length && Number.isFinite(threshold)) {
    const lo = Math.min(...snrPoints.map((q) => q.low));
    const hi = Math.max(...snrPoints.map((q) => q.high));
    const curve = Array.from({ length: 121 }, (_, i) => {
      const rho = lo + ((hi - lo) * i) / 120;
      return { rho, pr: gaussianDetectionProbability(rho, threshold) };
    });
    extra.push(Plot.line(curve, { x: "rho", y: "pr", stroke: INK.guide, strokeDasharray: GUIDE_DASH }));
    extra.push(Plot.ruleX([threshold], { stroke: INK.guide }));
  }
  figures.push(
    figure(
      "efficiency-snr",
      efficiencyPlot(snrPoints, "optimal SNR", extra),
      `Efficiency against optimal SNR (diamonds: found fraction per bin; bars: ${s.interval}). Dashed grey: Gaussian-noise expectation ` +
        `Q₁(ρ, ${threshold}) for an exactly matching template at the known time (Marcum Q-function); vertical line: the threshold.` +
        (s.snr50 === null ? "" : ` 50% reached at optimal SNR ≈ ${s.snr50.toFixed(2)}.`),
    ),
  );

  // 2. Efficiency against distance.
  const dPoints: BinPoint[] = s.efficiencyByDistance
    .filter((b) => b.total > 0)
    .map((b) => ({ x: (b.distanceLowMpc + b.distanceHighMpc) / 2, low: b.distanceLowMpc, high: b.distanceHighMpc, e: b.efficiency!, lo: b.lower!, hi: b.upper!, n: b.total }));
  figures.push(
    figure(
      "efficiency-distance",
      efficiencyPlot(dPoints, "luminosity distance (Mpc)"),
      `Efficiency against distance (${s.interval}).` +
        (p.distanceRangeMpc
          ? s.distance50Mpc === null
            ? " The efficiency does not fall through 50% in the range drawn."
            : ` 50% at ≈ ${s.distance50Mpc.toFixed(1)} Mpc.`
          : " Distances here follow from the target SNRs and the orientations, so this curve mixes orientations unevenly."),
    ),
  );

  // 3. Found and missed injections in distance and chirp mass.
  const fm = injections.map((o) => ({ d: o.distanceMpc, mc: o.chirpMassSolar, found: o.found, snr: o.optimalSnr }));
  figures.push(
    figure(
      "found-missed",
      fm.length
        ? renderSvg({
            width: WIDTH,
            height: HEIGHT,
            marginLeft: 55,
            x: { label: "luminosity distance (Mpc)", type: "log", grid: true },
            y: { label: "chirp mass (M☉)", grid: true },
            marks: [
              Plot.dot(
                fm.filter((q) => q.found),
                { x: "d", y: "mc", ...FOUND_MARK, ariaDescription: "found", title: (q: { snr: number }) => `found, optimal SNR ${q.snr.toFixed(1)}` },
              ),
              Plot.dot(
                fm.filter((q) => !q.found),
                { x: "d", y: "mc", ...MISSED_MARK, ariaDescription: "missed", title: (q: { snr: number }) => `missed, optimal SNR ${q.snr.toFixed(1)}` },
              ),
            ],
          })
        : noData("no injections"),
      `Found (${FOUND_WORDS}) and missed (${MISSED_WORDS}) injections by distance and chirp mass: ${s.found} found, ${s.missed} missed.`,
    ),
  );

  // 4. Recovered against optimal SNR.
  const rec = found.map((o) => ({ opt: o.optimalSnr, rec: o.recoveredSnr! }));
  const top = Math.max(1, ...rec.map((q) => Math.max(q.opt, q.rec)));
  figures.push(
    figure(
      "snr-recovery",
      rec.length
        ? renderSvg({
            width: WIDTH,
            height: HEIGHT,
            marginLeft: 50,
            x: { label: "optimal SNR", grid: true },
            y: { label: "recovered SNR", grid: true },
            marks: [
              Plot.line([{ a: 0, b: 0 }, { a: top, b: top }], { x: "a", y: "b", stroke: INK.guide, strokeDasharray: GUIDE_DASH }),
              Plot.dot(rec, { x: "opt", y: "rec", ...FOUND_MARK }),
            ],
          })
        : noData("no injection was found"),
      "Recovered SNR of each found injection against its optimal SNR (dashed: equality). Noise scatters the recovered SNR by about ±1; " +
        "a bank that does not match the signal exactly and an estimated PSD lower it." +
        (s.snrRatio ? ` Median ratio ${s.snrRatio.median.toFixed(3)}.` : ""),
    ),
  );

  // 5–6. Parameter errors.
  const mcErr = found.map((o) => ({ v: 100 * o.chirpMassError! }));
  figures.push(
    figure(
      "chirp-mass-error",
      mcErr.length
        ? renderSvg({
            width: WIDTH,
            height: 260,
            marginLeft: 50,
            x: { label: "chirp-mass error (recovered − injected) / injected (%)" },
            y: { label: "injections", grid: true },
            marks: [Plot.rectY(mcErr, { ...Plot.binX({ y: "count" }, { x: "v" }), fill: INK.main }), Plot.ruleY([0]), Plot.ruleX([0], { stroke: INK.guide })],
          })
        : noData("no injection was found"),
      s.chirpMassError
        ? `Relative chirp-mass error of found injections: median ${(100 * s.chirpMassError.median).toFixed(3)}%, ` +
            `5–95% range [${(100 * s.chirpMassError.p05).toFixed(3)}%, ${(100 * s.chirpMassError.p95).toFixed(3)}%].`
        : "No injection was found.",
    ),
  );
  const tErr = found.map((o) => ({ v: 1000 * o.timeError! }));
  figures.push(
    figure(
      "time-error",
      tErr.length
        ? renderSvg({
            width: WIDTH,
            height: 260,
            marginLeft: 50,
            x: { label: "coalescence-time error, candidate − injection at the detector (ms)" },
            y: { label: "injections", grid: true },
            marks: [Plot.rectY(tErr, { ...Plot.binX({ y: "count" }, { x: "v" }), fill: INK.main }), Plot.ruleY([0]), Plot.ruleX([0], { stroke: INK.guide })],
          })
        : noData("no injection was found"),
      s.timeErrorSeconds
        ? `Coalescence-time error of found injections: median ${(1000 * s.timeErrorSeconds.median).toFixed(3)} ms, ` +
            `5–95% range [${(1000 * s.timeErrorSeconds.p05).toFixed(3)}, ${(1000 * s.timeErrorSeconds.p95).toFixed(3)}] ms.`
        : "No injection was found.",
    ),
  );

  const misses = injections
    .filter((o) => !o.found)
    .sort((a, b) => b.optimalSnr - a.optimalSnr || a.index - b.index)
    .slice(0, WORST_MISSES);
  const missRows = misses
    .map(
      (o) =>
        `<tr><td>${o.index}</td><td>${o.batch}</td><td>${o.optimalSnr.toFixed(2)}</td><td>${o.distanceMpc.toPrecision(4)}</td>` +
        `<td>${o.primaryMassSolar.toFixed(3)} + ${o.secondaryMassSolar.toFixed(3)}</td><td>${o.chirpMassSolar.toFixed(4)}</td>` +
        `<td>${o.arrivalTime.toFixed(4)}</td><td>${o.inclination.toFixed(2)}</td></tr>`,
    )
    .join("\n");
  const falseRows = [...doc.falseCandidates]
    .sort((a, b) => b.snr - a.snr)
    .slice(0, 10)
    .map((c) => `<tr><td>${c.batch}</td><td>${c.coalescenceTime.toFixed(4)}</td><td>${c.snr.toFixed(2)}</td><td>${c.reweightedSnr.toFixed(2)}</td><td>${c.chirpMassSolar.toFixed(4)}</td></tr>`)
    .join("\n");
  const reqRows = doc.requirements
    .map((q) => `<tr class="${q.met ? "met" : "unmet"}"><td><code>${esc(q.rule)}</code></td><td>${q.met ? "met" : "NOT MET"}</td><td>${esc(q.detail)}</td></tr>`)
    .join("\n");
  const fmt = (x: number | null, d = 3) => (x === null ? "–" : x.toFixed(d));
  const summaryRows: [string, string][] = [
    ["injections", `${s.injections} in ${doc.layout.batches} batch(es) of ${doc.layout.batchSeconds} s`],
    ["found / missed", `${s.found} / ${s.missed}`],
    ["efficiency", `${fmt(s.efficiency)} [${fmt(s.efficiencyLower)}, ${fmt(s.efficiencyUpper)}] (${s.interval})`],
    ["50% efficiency, optimal SNR", fmt(s.snr50, 2)],
    ["50% efficiency, distance", s.distance50Mpc === null ? "–" : `${s.distance50Mpc.toFixed(1)} Mpc`],
    [
      "sensitive volume",
      s.sensitiveVolumeMpc3 === null ? `– (${s.volumeMethod})` : `${s.sensitiveVolumeMpc3.toPrecision(4)} ± ${s.sensitiveVolumeErrorMpc3!.toPrecision(2)} Mpc³ (${s.volumeMethod})`,
    ],
    ["median |chirp-mass error|", s.chirpMassError ? `${(100 * s.chirpMassError.medianAbsolute).toFixed(3)}%` : "–"],
    ["median |time error|", s.timeErrorSeconds ? `${(1000 * s.timeErrorSeconds.medianAbsolute).toFixed(3)} ms` : "–"],
    ["false candidates", `${s.falseCandidates} (candidates matched to no injection)`],
    ["analysed data", `${s.analysedSeconds.toFixed(0)} s`],
  ];
  const setup: [string, string][] = [
    ["noise", p.noise],
    ["population", `${p.count} injections, component masses uniform in ${p.massRangeSolar.join("–")} M☉, ` +
      (p.snrRange ? `optimal SNR uniform in ${p.snrRange.join("–")}` : `distance ${p.distanceDistribution === "uniform" ? "uniform in distance" : "uniform in volume"} in ${p.distanceRangeMpc!.join("–")} Mpc`) +
      `, isotropic sky and orientation, seed "${p.seed}"`],
    ["signals", `TaylorT4 time-domain inspirals from ${p.fMinHz} Hz, projected onto the invented detector ${p.detector}`],
    ["search", `${String(doc.arguments.templates)} TaylorF2 templates (${String(doc.arguments.bank)}), threshold SNR ${threshold}, PSD ${String(doc.arguments.psd)}, ` +
      `match window ±${doc.layout.matchWindowSeconds} s`],
  ];
  const rows = (list: [string, string][]) => list.map(([k, v]) => `<tr><th>${esc(k)}</th><td>${esc(v)}</td></tr>`).join("\n");

  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>chirpsieve injection-recovery campaign</title>
<style>
body { font-family: system-ui, sans-serif; max-width: 980px; margin: 2em auto; padding: 0 1em; color: #222; }
.notice { border: 2px solid ${INK.second}; background: #fff8ec; padding: 0.8em 1em; border-radius: 4px; }
table { border-collapse: collapse; margin: 0.5em 0 1.5em; font-size: 0.92em; }
th, td { border: 1px solid #ccc; padding: 0.25em 0.6em; text-align: left; vertical-align: top; }
th { background: #f4f4f4; }
tr.unmet td { background: #fdebcc; }
figure.plot { margin: 1.5em 0; }
figcaption { font-size: 0.9em; color: #444; max-width: ${WIDTH}px; }
</style>
</head>
<body>
<h1>Injection-recovery campaign</h1>
<p class="notice" id="caution"><strong>${esc(doc.caution)}</strong> ${
    p.synthetic
      ? "The data are <strong>synthetic</strong>: simulated Gaussian noise from an analytic noise curve, with simulated signals."
      : "The signals are simulated; the noise comes from the strain files named below."
  } Efficiencies describe this search on these data, not the rate or existence of any astrophysical source.</p>
<h2>Set-up</h2>
<table>${rows(setup)}</table>
<h2>Summary</h2>
<table>${rows(summaryRows)}</table>
${doc.requirements.length ? `<h2>Requirements</h2>\n<table><tr><th>rule</th><th>result</th><th>measured</th></tr>\n${reqRows}</table>` : ""}
<h2>Plots</h2>
${figures.join("\n")}
<h2>Worst misses</h2>
<p>Missed injections with the highest optimal SNR (at most ${WORST_MISSES}).</p>
${
  misses.length
    ? `<table id="worst-misses"><tr><th>injection</th><th>batch</th><th>optimal SNR</th><th>distance (Mpc)</th><th>masses (M☉)</th><th>chirp mass (M☉)</th><th>arrival time (s)</th><th>inclination (rad)</th></tr>\n${missRows}</table>`
    : `<p id="worst-misses">No injection was missed.</p>`
}
<h2>False candidates</h2>
<p>${s.falseCandidates} candidate(s) matched no injection${s.falseCandidates ? "; the loudest:" : "."}</p>
${falseRows ? `<table><tr><th>batch</th><th>time (s)</th><th>SNR</th><th>reweighted SNR</th><th>chirp mass (M☉)</th></tr>\n${falseRows}</table>` : ""}
<p><small>chirpsieve ${esc(doc.version)}, results format ${doc.format}.</small></p>
</body>
</html>
`;
}
