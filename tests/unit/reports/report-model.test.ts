// The report model: standing verdicts after overrides, what is listed as a call and what as absent,
// the range and lamp-check warnings, the flame cautions, the settings and the provenance block.
import { describe, expect, it } from "vitest";
import { buildRunReport, shortRunId } from "@/lib/reports/report-model";
import { SCREENING_CAVEAT } from "@/lib/reports/report-text";
import { standingVerdicts } from "@/lib/runs/standing-verdicts";
import { sampleCalibration, sampleInput, sampleRun } from "./fixtures";

describe("buildRunReport", () => {
  it("lists present and possible calls strongest first and the absent candidates apart", () => {
    const report = buildRunReport(sampleInput());
    expect(report.calls.map((c) => [c.species, c.verdict])).toEqual([
      ["Na I", "present"],
      ["K I", "possible"],
    ]);
    expect(report.absentSpecies).toEqual(["Ba I"]);
    expect(report.absentLimits).toEqual([
      { species: "Ba I", limit: "< 48 counts (0.40 % of the strongest peak) at 553.55 nm" },
    ]);
    expect(report.caveat).toBe(SCREENING_CAVEAT);
    expect(report.title).toContain(`run ${shortRunId(report.runId)} v1`);
  });

  it("shows the standing verdict and keeps an overridden call in the list with its reason", () => {
    const run = sampleRun();
    run.overrides = [
      {
        id: "o1",
        species: "Ba I",
        computedVerdict: "absent",
        verdict: "possible",
        reason: "green flame seen by eye",
        byName: "Chris",
        at: "2026-03-01T11:00:00.000Z",
      },
      {
        id: "o2",
        species: "K I",
        computedVerdict: "possible",
        verdict: "absent",
        reason: "line is an argon artefact",
        byName: "Chris",
        at: "2026-03-01T11:05:00.000Z",
      },
    ];
    run.verdicts = standingVerdicts(run.calls, run.overrides);
    const report = buildRunReport(sampleInput(run));
    const ba = report.calls.find((c) => c.species === "Ba I")!;
    expect(ba.verdict).toBe("possible");
    expect(ba.computedVerdict).toBe("absent");
    expect(ba.override?.reason).toBe("green flame seen by eye");
    const k = report.calls.find((c) => c.species === "K I")!;
    expect(k.verdict).toBe("absent");
    expect(k.override?.reason).toBe("line is an argon artefact");
    expect(report.absentSpecies).toEqual([]);
  });

  it("warns when the sample runs past the calibrated range and when the run is not lamp-checked", () => {
    const inside = buildRunReport(sampleInput(sampleRun({ rangeNm: [410, 800] })));
    expect(inside.outsideCoveredRange).toBe(false);
    expect(inside.warnings).toEqual([]);
    const outside = buildRunReport(
      sampleInput(
        sampleRun({
          rangeNm: [350, 900],
          lampChecked: false,
          warnings: [{ code: "outside-covered-range", message: "core wording" }],
        }),
      ),
    );
    expect(outside.outsideCoveredRange).toBe(true);
    expect(
      outside.warnings.some((w) => w.includes("past the calibrated range 404.7–811.5 nm")),
    ).toBe(true);
    expect(outside.warnings.some((w) => w.startsWith("Not lamp-checked"))).toBe(true);
    // The core's wording of the same warning is replaced by the report's, not repeated.
    expect(outside.warnings).not.toContain("core wording");
  });

  it("carries the flame cautions only for a flame", () => {
    expect(buildRunReport(sampleInput()).flameCautions?.length).toBeGreaterThan(0);
    expect(buildRunReport(sampleInput(sampleRun({ source: "arc" }))).flameCautions).toBeNull();
  });

  it("names the settings, the calibration, the release and the sample hash", () => {
    const report = buildRunReport(sampleInput(sampleRun({ settings: { minSnr: 5, k: 2.5 } })));
    expect(report.settings).toEqual([
      { label: "Minimum SNR", value: "5" },
      { label: "Match window (k·σ)", value: "2.5" },
    ]);
    expect(buildRunReport(sampleInput()).settings).toEqual([
      { label: "Settings", value: "the defaults" },
    ]);
    expect(report.calibration).toMatchObject({
      model: "polynomial-3",
      rmsNm: 0.0123,
      coveredRangeNm: [404.66, 811.53],
    });
    const made = Object.fromEntries(report.provenance.map((f) => [f.label, f.value]));
    expect(made["Line-table release"]).toContain("release 3, published 2026-02-20");
    expect(made["Sample SHA-256"]).toBe("ab".repeat(32));
    expect(made.Calibration).toContain(sampleCalibration().id);
  });

  it("says when there is no calibration", () => {
    const report = buildRunReport(
      sampleInput(sampleRun({ calibrationId: null, lampChecked: false }), { calibration: null }),
    );
    expect(report.calibration).toBeNull();
    expect(report.provenance.find((f) => f.label === "Calibration")?.value).toMatch(/own axis/);
  });
});
