export * from "./cascadeNetworks.ts";
export * from "./embeddedBlock.ts";
export * from "./frontEnd.ts";
export * from "./packageModel.ts";
export * from "./receiverFilter.ts";
export * from "./terminatedTransfer.ts";
export * from "./transmissionLine.ts";
export * from "./twoPortNetwork.ts";
