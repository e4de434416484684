// The fewest pairs a calibration is trusted on, automatic or by hand: the pairing's own check and the
// workbench's doubts ask the same. Six, with every other check passed: on six blind sweeps of 300
// instruments (seeds 1000, 7900000–8300000) six instead of seven turned 25 right automatic pairings
// from "check" into "paired", silent wrong unchanged on each seed.
export const MIN_TRUSTED_PAIRS = 6;
