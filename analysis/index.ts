// Public surface of the analysis core. Pure functions only: no I/O, no
// database, no UI, so the server and the browser share the same numbers.

export * from "./units/convert";
export * from "./units/volume";
export * from "./chemistry/saturation";
export * from "./metals/reading";
export * from "./metals/episodes";
export * from "./metals/route-book";
export * from "./metals/shared-source";
export * from "./metals/likely-source";
export * from "./stats/distributions";
export * from "./stats/intervals";
export * from "./stats/survival";
export * from "./stats/rank-tests";
export * from "./stats/groups";
export * from "./outcomes/treatments";
export * from "./outcomes/summary";
export * from "./settings";
