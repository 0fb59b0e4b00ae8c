import * as Plot from "@observablehq/plot";
import { parseHTML } from "linkedom";

/**
 * Renders an Observable Plot specification to a standalone SVG string (Node has no DOM, so
 * linkedom supplies one). Pass the same options as Plot.plot, without `document`.
 */
export function renderSvg(options: Plot.PlotOptions): string {
  const { document } = parseHTML("<!DOCTYPE html><html><body></body></html>");
  const node = Plot.plot({ ...options, document: document as never }) as unknown as {
    outerHTML: string;
    tagName: string;
  };
  let svg = node.outerHTML;
  // A figure wraps the svg when the plot has a title/legend; keep the whole figure as an <svg> with foreignObject is
  // not portable, so callers should avoid titles/legends for standalone files and use `caption` in HTML reports.
  if (!svg.startsWith("<svg")) {
    const m = svg.match(/<svg[\s\S]*<\/svg>/);
    if (m) svg = m[0];
  }
  if (!svg.includes('xmlns="http://www.w3.org/2000/svg"')) {
    svg = svg.replace("<svg", '<svg xmlns="http://www.w3.org/2000/svg"');
  }
  return svg;
}
