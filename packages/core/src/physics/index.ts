export * from "./constants.js";
