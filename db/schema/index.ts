export * from "./enums";
export * from "./cooperative";
export * from "./registries";
export * from "./trials";
export * from "./season";
export * from "./audit";
export * from "./mail";
export * from "./pooled";
