export * from "./convolve.ts";
export * from "./decibels.ts";
export * from "./fftPlan.ts";
export * from "./interpolateLinear.ts";
export * from "./minimumPhase.ts";
export * from "./resampleLinear.ts";
export * from "./seededRandom.ts";
export * from "./windows.ts";
