export * from "./segmentSpectrum.js";
export * from "./snrSeries.js";
export * from "./peaks.js";
export * from "./bandLimitedPeaks.js";
export * from "./chisq.js";
export * from "./reweight.js";
