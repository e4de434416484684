// Issue 12's interference cases through the whole analysis, on samples of the realistic generator
// built around each case: the interfering element is never called present.
import { describe, it, expect } from "vitest";
import { analyzeSample } from "@/lib/spectrum/analysis";
import { prepareLineIndex } from "@/lib/spectrum/matching";
import { STARTER_TABLE } from "../../../support/realistic-lamp";
import { BAND_METAL, INTERFERENCE_CASES, realisticSample } from "../../../support/realistic-sample";

const INDEX = prepareLineIndex(STARTER_TABLE);
const PER_CASE = 4;

/** The first PER_CASE samples of a fixed seed stream built around each case. */
function samplesOf(caseName: string) {
  const found = [];
  for (let i = 0; i < 3000 && found.length < PER_CASE; i++) {
    const sample = realisticSample(4_200_000 + i);
    if (sample.truth.interference === caseName) found.push(sample);
  }
  return found;
}

describe.each(INTERFERENCE_CASES.filter((c) => c.interferer !== null))("$name", (c) => {
  const samples = samplesOf(c.name);

  it(`has ${PER_CASE} samples of the case to judge`, () => {
    expect(samples).toHaveLength(PER_CASE);
  });

  it("never calls the interfering element present, while the element in the mix is seen", () => {
    let elementSeen = 0;
    for (const sample of samples) {
      const analysis = analyzeSample(sample.x, sample.y, INDEX, {
        calibration: sample.calibration,
        source: sample.source,
        ...sample.resolution,
      });
      const calls = analysis.identification.calls;
      const metal = (element: string) => BAND_METAL[element] ?? element;
      for (const call of calls.filter((x) => metal(x.element) === c.interferer)) {
        expect(call.verdict, `${sample.seed} ${call.species}`).not.toBe("present");
      }
      if (calls.some((x) => x.element === c.element && x.verdict !== "absent")) elementSeen++;
    }
    // The samples are the case: the element that draws the interference is there to be seen.
    expect(elementSeen).toBeGreaterThanOrEqual(PER_CASE / 2);
  });
});
