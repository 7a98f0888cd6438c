export * from "./platform";
export * from "./equipment";
