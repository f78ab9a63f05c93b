// Every table of Tapwright, split by domain.
export * from "./columns";
export * from "./auth";
export * from "./audit";
