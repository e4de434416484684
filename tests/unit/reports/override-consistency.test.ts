// One overridden call, four outputs: the run page's chart labels, the report (and the PDF chart's
// labels drawn from it) and the notebook CSV all show the standing verdict, with the computed one
// beside it where the output has room.
import { describe, expect, it } from "vitest";
import { runChartLabels } from "@/components/runs/run-labels";
import { chartLabelsFromCalls } from "@/lib/reports/chart-geometry";
import { formatNotebookCallsCsv } from "@/lib/reports/notebook-calls-csv";
import { buildRunReport } from "@/lib/reports/report-model";
import Papa from "papaparse";
import { standingVerdicts } from "@/lib/runs/standing-verdicts";
import { NA_D2, sampleInput, sampleRun } from "./fixtures";

describe("an overridden call reads the same everywhere", () => {
  // The chemist overrides sodium from present to possible (a contaminated blank).
  const run = sampleRun();
  run.overrides = [
    {
      id: "o1",
      species: "Na I",
      computedVerdict: "present",
      verdict: "possible",
      reason: "blank shows it too",
      byName: "Chris",
      at: "2026-03-01T11:00:00.000Z",
    },
  ];
  run.verdicts = standingVerdicts(run.calls, run.overrides);
  // As the service hands calls to pages: `verdict` is the standing one.
  run.calls = run.calls.map((c) =>
    c.species === "Na I"
      ? { ...c, verdict: "possible", computedVerdict: "present", override: run.overrides[0] }
      : c,
  );

  it("labels the sodium peaks as possible on the run page's chart", () => {
    const labels = runChartLabels(run.calls).filter((l) => l.species.includes("Na I"));
    expect(labels.length).toBeGreaterThan(0);
    for (const l of labels) expect(l.verdict).toBe("possible");
  });

  it("lists it as possible, computed present, in the report, and labels the PDF chart so", () => {
    const report = buildRunReport(sampleInput(run));
    const na = report.calls.find((c) => c.species === "Na I")!;
    expect(na).toMatchObject({ verdict: "possible", computedVerdict: "present" });
    expect(na.override?.reason).toBe("blank shows it too");
    const labels = chartLabelsFromCalls(report.calls).filter((l) => l.species.includes("Na I"));
    expect(labels.map((l) => l.peakNm)).toContain(589.001);
    for (const l of labels) expect(l.verdict).toBe("possible");
    expect(NA_D2).toBeCloseTo(589.0, 0);
  });

  it("writes the standing and the computed verdict in the notebook CSV", () => {
    const text = formatNotebookCallsCsv(
      [{ run, authorName: "Chris", instrumentName: "Grating bench" }],
      { notebookId: run.notebookId },
    );
    const rows = Papa.parse<Record<string, string>>(text, {
      header: true,
      skipEmptyLines: true,
      comments: "#",
    }).data;
    expect(rows.find((r) => r.species === "Na I")).toMatchObject({
      standing_verdict: "possible",
      computed_verdict: "present",
      override_reason: "blank shows it too",
    });
  });
});
