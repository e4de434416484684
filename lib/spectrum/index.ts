// The numerical core's public API, stage by stage; tests/unit/spectrum/public-api.test.ts keeps a
// snapshot of these names so any change to the API shows up in review.
export * from "./types";
export * from "./io";
export * from "./units";
export * from "./signal";
export * from "./peaks";
export * from "./calibration";
export * from "./matching";
export * from "./temperature";
export * from "./statistics";
export * from "./synthetic";
export * from "./analysis";
