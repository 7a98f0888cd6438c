export * from "./platform";
export * from "./equipment";
export * from "./trees";
export * from "./runs";
export * from "./audit";
export * from "./insights";
export * from "./training";
export * from "./counters";
