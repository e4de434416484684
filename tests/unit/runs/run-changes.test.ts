// What a re-run changed: calls whose verdict or shown score moved, species weighed on one side only,
// and unexplained peaks that gained or lost a candidate line.
import { describe, expect, it } from "vitest";
import { runChanges, type ComparedRun } from "@/lib/runs/run-changes";

const earlier: ComparedRun = {
  id: "run-1",
  lineReleaseNumber: 3,
  calls: [
    { species: "Na I", verdict: "present", score: 0.91 },
    { species: "K I", verdict: "possible", score: 0.42 },
    { species: "Li I", verdict: "absent", score: 0.1 },
    { species: "Ba II", verdict: "absent", score: 0.05 },
  ],
  unexplained: [{ wavelengthNm: 460.733 }, { wavelengthNm: 610.364 }],
};

describe("runChanges", () => {
  it("lists what moved between a run and its re-run", () => {
    const changes = runChanges(earlier, {
      lineReleaseNumber: 4,
      calls: [
        { species: "Na I", verdict: "present", score: 0.912 },
        { species: "K I", verdict: "present", score: 0.42 },
        { species: "Li I", verdict: "absent", score: 0.11 },
        { species: "Sr I", verdict: "possible", score: 0.5 },
      ],
      unexplained: [{ wavelengthNm: 610.364 }, { wavelengthNm: 670.776 }],
    });
    expect(changes).toEqual({
      earlierRunId: "run-1",
      earlierReleaseNumber: 3,
      releaseNumber: 4,
      changedCalls: [
        {
          species: "K I",
          before: { verdict: "possible", score: 0.42 },
          after: { verdict: "present", score: 0.42 },
        },
        {
          species: "Li I",
          before: { verdict: "absent", score: 0.1 },
          after: { verdict: "absent", score: 0.11 },
        },
      ],
      newSpecies: [{ species: "Sr I", verdict: "possible" }],
      goneSpecies: [{ species: "Ba II", verdict: "absent" }],
      newlyExplainedNm: [460.733],
      newlyUnexplainedNm: [670.776],
    });
  });

  it("finds nothing changed in a run repeated as it was", () => {
    const changes = runChanges(earlier, earlier);
    expect(changes.changedCalls).toEqual([]);
    expect(changes.newSpecies).toEqual([]);
    expect(changes.goneSpecies).toEqual([]);
    expect(changes.newlyExplainedNm).toEqual([]);
    expect(changes.newlyUnexplainedNm).toEqual([]);
  });
});
