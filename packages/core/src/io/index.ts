export * from "./atomicWrite.js";
export * from "./strainTypes.js";
export * from "./strainFormat.js";
export * from "./strainFile.js";
export * from "./memoryStrain.js";
export * from "./readTextInput.js";
export * from "./timeBase.js";
