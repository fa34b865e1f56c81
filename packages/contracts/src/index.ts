export * from "./common.ts";
export * from "./accounts.ts";
export * from "./health.ts";
export * from "./paths.ts";
export * from "./yard.ts";
export * from "./listings.ts";
export * from "./catalogue.ts";
export * from "./orders.ts";
