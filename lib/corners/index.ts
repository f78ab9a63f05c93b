export * from "./cornerBudget.ts";
export * from "./cornerPulses.ts";
export * from "./lossScaledPulse.ts";
export * from "./lossScaledS21.ts";
