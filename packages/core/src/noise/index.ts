export * from "./psdModel.js";
