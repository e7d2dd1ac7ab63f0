// The whole schema, one file per domain. db/index.ts imports this as `schema`.
export * from "./users";
export * from "./projects";
export * from "./arms";
export * from "./plans";
export * from "./recordings";
export * from "./tokens";
export * from "./audit";
export * from "./courses";
export * from "./mail";
export * from "./account-tokens";
export * from "./datasets";
