// Every table of Tapwright, split by domain.
export * from "./columns";
export * from "./auth";
export * from "./audit";
export * from "./channels";
export * from "./budgets";
export * from "./jobs";
export * from "./studies";
export * from "./tapTables";
export * from "./signoff";
export * from "./aggressors";
export * from "./sweeps";
