// The Savitzky–Golay window (quartic) for lines of a known width in samples: the default 9 samples for
// lines of 3.5 samples or more, 7 for lines sampled more coarsely, where 9 samples would smooth away the
// dip between two lines 1.5 FWHM apart (the Na D pair at 0.4 nm resolution and 0.16 nm per sample).

/** Lines narrower than this many samples (FWHM) get the narrower window. */
const NARROW_LINE_SAMPLES = 3.5;

/** The quartic smoothing window, in samples, for lines `fwhmSamples` wide (9 when the width is unknown). */
export function smoothingWindowFor(fwhmSamples: number): number {
  if (!(fwhmSamples > 0) || !Number.isFinite(fwhmSamples)) return 9;
  return fwhmSamples < NARROW_LINE_SAMPLES ? 7 : 9;
}
