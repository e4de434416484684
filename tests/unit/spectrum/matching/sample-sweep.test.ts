// The element-identification sweep of issue 12 on one fixed seed: 200 realistic flame and arc
// samples (tests/support/realistic-sample.ts) through analyzeSample against the starter table,
// scored against the generator's truth. The figures asserted are regression floors: what the
// identification measured when they were last set (seed 12, n 200: recall 64.1 % (382 of 596),
// 92.0 % where the principal line is in range, false present 1.24 % of absent pairs (25 of 2013),
// 22 samples with one, 58 present calls on a single line another species explains), since a present
// call on one peak that another credible species also explains is "possible". When the sweep was
// written: 64.8 %, 92.0 %, 2.1 %, 38 and 82. Issue 12's aim: recall ≥ 95 % where
// the principal line is in range, false present ≤ 0.5 % of absent element–sample pairs, and no
// "present" on a single line another species explains. Raise the floors as the work lands;
// try other seeds with `npm run sweep -- --samples --seed N --n M`.
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
    expect(fraction(summary.recall)).toBeGreaterThanOrEqual(0.64);
    expect(fraction(summary.recallPrincipalInRange)).toBeGreaterThanOrEqual(0.919);
  });

  it("holds today's false present (ceilings)", () => {
    expect(fraction(summary.falsePresent)).toBeLessThanOrEqual(0.0125);
    expect(summary.samplesWithFalsePresent).toBeLessThanOrEqual(22);
    expect(summary.singleLineExplained).toBeLessThanOrEqual(58);
  });
});
