// The standing-verdict rule: the newest override of a call stands, a withdrawn one gives the computed
// verdict back, and the override that stands is the newest unless it was a withdrawal.
import { describe, expect, it } from "vitest";
import { overridesByRunOf, standingOverride, standingVerdicts } from "@/lib/runs/standing-verdicts";
import type { Verdict } from "@/lib/spectrum/matching";

const calls = [
  { species: "Na I", verdict: "present" as Verdict },
  { species: "K I", verdict: "possible" as Verdict },
  { species: "Ba I", verdict: "absent" as Verdict },
];
const override = (species: string, computedVerdict: Verdict, verdict: Verdict | null) => ({
  species,
  computedVerdict,
  verdict,
});

describe("standingVerdicts", () => {
  it("keeps the computed verdicts when nothing is overridden", () => {
    expect(standingVerdicts(calls, [])).toEqual({
      "Na I": "present",
      "K I": "possible",
      "Ba I": "absent",
    });
  });

  it("lets the newest override stand, and a withdrawal give the computed verdict back", () => {
    const history = [
      override("Na I", "present", "possible"),
      override("K I", "possible", "absent"),
      override("Na I", "present", "absent"),
      override("K I", "possible", null),
    ];
    expect(standingVerdicts(calls, history)).toEqual({
      "Na I": "absent",
      "K I": "possible",
      "Ba I": "absent",
    });
    expect(standingOverride(history, "Na I")).toBe(history[2]);
    expect(standingOverride(history, "K I")).toBeNull();
    expect(standingOverride(history, "Ba I")).toBeNull();
  });

  it("takes an override's own computed verdict for a species the calls no longer list", () => {
    expect(standingVerdicts(calls, [override("Li I", "possible", null)])["Li I"]).toBe("possible");
  });
});

describe("overridesByRunOf", () => {
  it("groups by run and keeps each run's history in the order given", () => {
    const grouped = overridesByRunOf([
      { runId: "a", override: 1 },
      { runId: "b", override: 2 },
      { runId: "a", override: 3 },
    ]);
    expect([...grouped]).toEqual([
      ["a", [1, 3]],
      ["b", [2]],
    ]);
  });
});
