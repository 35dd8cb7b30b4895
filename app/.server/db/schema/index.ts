export * from "./auth";
export * from "./company";
export * from "./field";
export * from "./routebook";
export * from "./exchange";
export * from "./security";
export * from "./kept";
export * from "./jobs";
