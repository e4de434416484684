// The PDF renderer: the file opens in Debian's poppler (pdftotext), holds the calls, the caveat on
// every page, the calibration, the release and the signature, embeds IBM Plex, and numbers its pages.
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { buildRunReport } from "@/lib/reports/report-model";
import { renderReportPdf } from "@/lib/reports/render-report-pdf";
import { SCREENING_CAVEAT } from "@/lib/reports/report-text";
import { sampleInput, sampleRun } from "./fixtures";

const fonts = {
  sans: fs.readFileSync(path.resolve("fonts/IBMPlexSans-Regular.woff")),
  sansBold: fs.readFileSync(path.resolve("fonts/IBMPlexSans-SemiBold.woff")),
  mono: fs.readFileSync(path.resolve("fonts/IBMPlexMono-Regular.woff")),
};

function poppler(tool: "pdftotext" | "pdffonts" | "pdfinfo", pdf: Buffer): string {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "emberline-report-"));
  try {
    const file = path.join(dir, "report.pdf");
    fs.writeFileSync(file, pdf);
    return execFileSync(
      `/usr/bin/${tool}`,
      tool === "pdftotext" ? ["-layout", file, "-"] : [file],
      { encoding: "utf8" },
    );
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

/** pdftotext breaks long sentences across lines: compare with whitespace collapsed. */
const flat = (text: string) => text.replace(/\s+/g, " ");

function spectrum() {
  const x = Float64Array.from({ length: 2000 }, (_, i) => 400 + i * 0.2);
  const y = Float64Array.from(
    x,
    (nm) =>
      30 +
      5000 * Math.exp(-(((nm - 589) / 0.6) ** 2)) +
      200 * Math.exp(-(((nm - 766.5) / 0.6) ** 2)),
  );
  return { wavelengthNm: x, counts: y };
}

// Rendering with font subsetting takes seconds on a busy machine: a generous limit keeps the test from flaking.
describe("renderReportPdf", { timeout: 60_000 }, () => {
  it("makes a PDF whose text holds the calls, the caveat, the calibration and the release", async () => {
    const run = sampleRun({
      overrides: [
        {
          id: "o",
          species: "Ba I",
          computedVerdict: "absent",
          verdict: "possible",
          reason: "green flame seen by eye",
          byName: "Chris",
          at: "2026-03-01T11:00:00.000Z",
        },
      ],
      verdicts: { "Na I": "present", "K I": "possible", "Ba I": "possible" },
    });
    const pdf = await renderReportPdf(buildRunReport(sampleInput(run)), {
      fonts,
      spectrum: spectrum(),
    });
    expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    const text = flat(poppler("pdftotext", pdf));
    for (const species of ["Na I", "K I", "Ba I"]) expect(text).toContain(species);
    expect(text).toContain(SCREENING_CAVEAT);
    expect(text).toContain("polynomial-3");
    expect(text).toContain("RMS 0.0123 nm");
    expect(text).toContain("404.66–811.53 nm");
    expect(text).toContain("release 3");
    expect(text).toContain("green flame seen by eye");
    expect(text).toContain("Flame test cautions");
    expect(text).toContain("Δλ (nm)");
    expect(text).toContain("Not signed.");

    const pages = Number(/Pages:\s+(\d+)/.exec(poppler("pdfinfo", pdf))![1]);
    expect(pages).toBeGreaterThanOrEqual(2);
    expect(text).toContain(`Page ${pages} of ${pages}`);
    // The caveat is in every page's footer.
    expect(text.split(SCREENING_CAVEAT).length - 1).toBeGreaterThanOrEqual(pages);
    expect(poppler("pdffonts", pdf)).toMatch(/IBMPlexSans/);
  });

  it("shows the signer, the meaning and the content hash of a signed run", async () => {
    const hash = "c0ffee".repeat(10) + "beef";
    const pdf = await renderReportPdf(
      buildRunReport(
        sampleInput(sampleRun({ status: "signed", source: "arc" }), {
          signature: {
            signerName: "Sam Supervisor",
            meaning: "Reviewed and approved",
            signedAt: "2026-03-02T09:30:00.000Z",
            contentHash: hash,
            round: 1,
          },
          rounds: [
            {
              round: 1,
              submittedByName: "Chris Chemist",
              submittedAt: "2026-03-01T12:00:00.000Z",
              requestedReviewerName: "Sam Supervisor",
              decision: "signed",
              decidedByName: "Sam Supervisor",
              decidedAt: "2026-03-02T09:30:00.000Z",
              comment: "agrees with the lamp check",
            },
          ],
        }),
      ),
      { fonts, spectrum: spectrum() },
    );
    const text = flat(poppler("pdftotext", pdf));
    expect(text).toContain("Sam Supervisor");
    expect(text).toContain("Reviewed and approved");
    expect(text).toContain(hash);
    expect(text).toContain("agrees with the lamp check");
    expect(text).not.toContain("Flame test cautions");
  });
});
