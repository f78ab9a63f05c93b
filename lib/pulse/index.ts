export * from "./assertPulse.ts";
export * from "./cursorsAt.ts";
export * from "./peakIndex.ts";
export * from "./pulseArea.ts";
export * from "./pulseJson.ts";
export * from "./scalePulse.ts";
export * from "./trimPulse.ts";
export * from "./pulseLoss.ts";
