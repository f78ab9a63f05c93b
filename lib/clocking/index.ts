export * from "./jitterTransfer.ts";
export * from "./samplingPhase.ts";
