export * from "./interSiteDelay.js";
export * from "./sites.js";
export * from "./siteResponse.js";
export * from "./falseAlarm.js";
export * from "./timeSlides.js";
export * from "./coincidence.js";
export * from "./analyseCoincidences.js";
