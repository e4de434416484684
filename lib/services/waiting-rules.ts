// The home page's thresholds, shared by the waiting service and the page that words them.

/** A calibration older than this many days is "old" on the home page (labs recalibrate daily). */
export const OLD_CALIBRATION_DAYS = 7;
