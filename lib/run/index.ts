export * from "./dfeAdaptation.ts";
export * from "./engineVersion.ts";
export * from "./tuningRun.ts";
