export * from "./architectureEvaluation.ts";
export * from "./ownOptimum.ts";
export * from "./populationDefault.ts";
export * from "./quantizeSetting.ts";
export * from "./registerMap.ts";
