export * from "./types.js";
export * from "./create.js";
