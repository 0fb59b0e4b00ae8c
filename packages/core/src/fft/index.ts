export * from "./types.js";
export * from "./create.js";
export * from "./backends.js";
