export * from "./aggressorKind.ts";
export * from "./aggressorSampling.ts";
export * from "./couplingModel.ts";
export * from "./crosstalkTransfers.ts";
export * from "./integratedCrosstalkNoise.ts";
export * from "./linkFromTouchstone.ts";
export * from "./crosstalkParts.ts";
export * from "./linkAggressor.ts";
