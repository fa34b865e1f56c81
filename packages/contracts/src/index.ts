export * from "./common.ts";
export * from "./accounts.ts";
export * from "./health.ts";
export * from "./paths.ts";
