export * from "./ber.ts";
export * from "./prbs.ts";
