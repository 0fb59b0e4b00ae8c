export * from "./pnCoefficients.js";
export * from "./alignedSpinPhase.js";
export * from "./taylorf2.js";
export * from "./chirpTimes.js";
export * from "./cycles.js";
export * from "./taylorT4Evolution.js";
export * from "./taylorT4.js";
export * from "./antenna.js";
