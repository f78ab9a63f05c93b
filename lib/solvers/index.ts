export * from "./convolutionMatrix.ts";
export * from "./lmsAdapt.ts";
export * from "./mmse.ts";
export * from "./txTraining.ts";
export * from "./wienerSolve.ts";
export * from "./zeroForcing.ts";
export * from "./mmseDfe.ts";
