// @chirpsieve/core public API: re-exports only.
export * from "./errors.js";
export * from "./physics/index.js";
export * from "./fft/index.js";
export * from "./noise/index.js";
export * from "./waveform/index.js";
export * from "./io/index.js";
export * from "./filter/index.js";
export * from "./bank/index.js";
export * from "./search/index.js";
export * from "./run/index.js";
export * from "./inject/index.js";
export * from "./coinc/index.js";
