// The element-identification sweep of issue 12 on one fixed seed: 200 realistic flame and arc
// samples (tests/support/realistic-sample.ts) through analyzeSample against the starter table,
// scored against the generator's truth. The figures asserted are regression floors: what the
// identification measured when they were last set (seed 12, n 200: recall 65.9 % (393 of 596),
// 96.7 % where the principal line is in range (350 of 362), false present 0.25 % of absent pairs
// (5 of 2006), 5 samples with one, no present call on a single line another species explains;
// before the sampled two-line dip, the lean of bands and the judged range: 65.6 %, 95.9 %, 0.35 %, 7):
// one peak proves only a principal line at SNR ≥ 7 that no other species explains, a band is offered only
// at a peak as wide as a band, a clean peak's window is what its width beyond the instrument's
// allows, an axis in nm reads its width trend from its clean peaks, and the peak finder keeps
// lines 2–3 samples wide apart and drops its smoothing's ringing. Issue 12's two rate targets
// hold on this seed and are asserted as such. Before that (same seed and generator): 64.4 %, 92.5 %,
// 1.09 %, 20 and 6. (The generator's prism samples now carry the calibration the workbench
// recommends; a degree-5 polynomial had put their red lines 4–6 nm off.) When the sweep was
// written: 64.8 %, 92.0 %, 2.1 %, 38.
// Issue 12's aim: recall ≥ 95 % where the principal line is in range, false present ≤ 0.5 % of
// absent element–sample pairs, and no "present" on a single line another species explains. Raise
// the floors as the work lands; try other seeds with `npm run sweep -- --samples --seed N --n M`.
import { describe, expect, it } from "vitest";
import { fraction, runSampleSweep, summariseSamples } from "../../../support/sample-sweep";

describe("sample sweep (seed 12, 200 samples)", () => {
  const records = runSampleSweep({ seed: 12, n: 200 });
  const summary = summariseSamples(records);

  it("analyses every sample without an exception", () => {
    expect(records).toHaveLength(200);
    expect(summary.exceptions).toBe(0);
  });

  it("holds today's recall of present (floors)", () => {
    expect(fraction(summary.recall)).toBeGreaterThanOrEqual(0.659);
    expect(fraction(summary.recallPrincipalInRange)).toBeGreaterThanOrEqual(0.965);
  });

  it("holds today's false present (ceilings)", () => {
    // Issue 12's own target, met on this seed: no present call on one peak another species explains.
    expect(summary.singleLineExplained).toBe(0);
    expect(fraction(summary.falsePresent)).toBeLessThanOrEqual(0.0025);
    expect(summary.samplesWithFalsePresent).toBeLessThanOrEqual(5);
  });
});
