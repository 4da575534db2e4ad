export * from "./lifecycle";
export * from "./randomisation";
export * from "./sample-size";
export * from "./outcome";
export * from "./analysis";
export * from "./factorial";
export * from "./report";
