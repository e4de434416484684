// The settings a sample is analysed with when the chemist leaves them blank; a module of its own with
// no imports, so pages (and the run form in the browser) can show them without loading the core.

/** minSnr: the lowest signal-to-noise ratio of a reported peak; k: the matching window in σ. */
export const SAMPLE_ANALYSIS_DEFAULTS = { minSnr: 5, k: 3 } as const;
