export * from "./atomicWrite.js";
