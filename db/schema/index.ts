export * from "./organisations";
export * from "./catalogue";
export * from "./vehicles";
export * from "./records";
export * from "./parts";
export * from "./known-issues";
export * from "./analysis";
export * from "./operations";
