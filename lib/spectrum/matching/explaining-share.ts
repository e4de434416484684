// The share of a peak at which a species' line counts as having made it.

/** A line expected at this share of the peak's SNR, or more, could have made the peak. */
export const EXPLAINING_SHARE = 0.3;
