export * from "./roles";
export * from "./errors";
export * from "./auth";
export * from "./portfolio";
export * from "./health";
export * from "./intake";
