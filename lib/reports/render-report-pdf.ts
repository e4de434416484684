// Renders a run's report as an A4 PDF with pdfkit: IBM Plex embedded (subset by fontkit), the
// spectrum as vector graphics, the calls with their evidence, calibration, release, settings and
// signatures, and on every page a header, the screening caveat and the page number.
import PDFDocument from "pdfkit";
import { chartGeometry, chartLabelsFromCalls } from "./chart-geometry";
import { detectionLimitsSentence } from "./detection-limit-text";
import { calibrationFields, releaseFields, signatureFields } from "./report-fields";
import { formatUtc, type ReportCall, type RunReport } from "./report-model";

export interface ReportFonts {
  /** IBM Plex Sans Regular (TTF, OTF or WOFF 1: fontkit cannot subset WOFF2). */
  sans: Buffer;
  sansBold: Buffer;
  mono: Buffer;
}

export interface RenderReportPdfOptions {
  fonts: ReportFonts;
  /** The calibrated spectrum, thinned for drawing (ascending nm). */
  spectrum: { wavelengthNm: Float64Array; counts: Float64Array };
}

const PAGE = { width: 595.28, height: 841.89 };
const MARGIN = { top: 56, bottom: 56, left: 50, right: 50 };
const CONTENT_WIDTH = PAGE.width - MARGIN.left - MARGIN.right;
const INK = "#1f1b16";
const MUTED = "#6b6257";
const EMBER = "#b4410f";
const RULE = "#cfc6ba";

type Doc = InstanceType<typeof PDFDocument>;

export function renderReportPdf(
  report: RunReport,
  options: RenderReportPdfOptions,
): Promise<Buffer> {
  const doc: Doc = new PDFDocument({
    size: "A4",
    margins: MARGIN,
    bufferPages: true,
    // Given here so pdfkit never loads its built-in Helvetica metrics from disk.
    font: options.fonts.sans as unknown as string,
    info: {
      Title: report.title,
      Author: report.authorName ?? "Emberline",
      Subject: "Qualitative screening report of an atomic emission spectrum",
      Creator: `Emberline ${report.softwareVersion}`,
      Producer: "Emberline (pdfkit)",
    },
    pdfVersion: "1.7",
  });
  doc.registerFont("sans", options.fonts.sans);
  doc.registerFont("bold", options.fonts.sansBold);
  doc.registerFont("mono", options.fonts.mono);

  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on("data", (chunk: Buffer) => chunks.push(chunk));
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);
  });

  const w = new Writer(doc);
  w.title(report);
  w.notice(report);
  w.chart(report, options.spectrum);
  w.calls(report);
  w.unexplained(report);
  w.calibration(report);
  w.settingsAndProvenance(report);
  w.review(report);
  w.headersAndFooters(report);
  doc.end();
  return done;
}

class Writer {
  constructor(private readonly doc: Doc) {}

  private get bottom(): number {
    return PAGE.height - MARGIN.bottom;
  }

  /** Starts a new page when less than `height` points are left. */
  private room(height: number): void {
    if (this.doc.y + height > this.bottom) this.doc.addPage();
  }

  /** A rule across the content width at `y`, `width` points thick. */
  private rule(y: number, width: number): void {
    this.doc
      .moveTo(MARGIN.left, y)
      .lineTo(MARGIN.left + CONTENT_WIDTH, y)
      .lineWidth(width)
      .strokeColor(RULE)
      .stroke();
  }

  private heading(text: string): void {
    this.room(60);
    this.doc.moveDown(0.8);
    this.doc
      .font("bold")
      .fontSize(12)
      .fillColor(INK)
      .text(text, MARGIN.left, this.doc.y, { width: CONTENT_WIDTH });
    const y = this.doc.y + 1;
    this.rule(y, 0.5);
    this.doc.y = y + 4;
  }

  private paragraph(
    text: string,
    options: { font?: string; size?: number; color?: string; indent?: number } = {},
  ): void {
    const { font = "sans", size = 9, color = INK, indent = 0 } = options;
    this.doc.font(font).fontSize(size);
    this.room(this.doc.heightOfString(text, { width: CONTENT_WIDTH - indent }) + 2);
    this.doc
      .fillColor(color)
      .text(text, MARGIN.left + indent, this.doc.y, { width: CONTENT_WIDTH - indent });
  }

  /** Label–value pairs in two columns. */
  private fields(fields: { label: string; value: string }[], mono = false): void {
    const labelWidth = 130;
    for (const f of fields) {
      this.doc.font(mono ? "mono" : "sans").fontSize(mono ? 8 : 9);
      const h = Math.max(
        this.doc.heightOfString(f.value, { width: CONTENT_WIDTH - labelWidth }),
        11,
      );
      this.room(h + 2);
      const y = this.doc.y;
      this.doc
        .font("sans")
        .fontSize(9)
        .fillColor(MUTED)
        .text(f.label, MARGIN.left, y, { width: labelWidth - 8 });
      this.doc
        .font(mono ? "mono" : "sans")
        .fontSize(mono ? 8 : 9)
        .fillColor(INK)
        .text(f.value, MARGIN.left + labelWidth, y, { width: CONTENT_WIDTH - labelWidth });
      this.doc.y = Math.max(this.doc.y, y + h) + 1;
    }
  }

  /** A table: fixed column widths, a bold header row, rows that break across pages with the header repeated. */
  private table(
    columns: { title: string; width: number; align?: "left" | "right" }[],
    rows: string[][],
    size = 8,
  ): void {
    const drawRow = (cells: string[], font: string) => {
      this.doc.font(font).fontSize(size);
      const h = Math.max(
        ...cells.map((c, i) => this.doc.heightOfString(c, { width: columns[i].width - 4 })),
        size + 2,
      );
      let x = MARGIN.left;
      const y = this.doc.y;
      cells.forEach((c, i) => {
        this.doc
          .fillColor(INK)
          .text(c, x, y, { width: columns[i].width - 4, align: columns[i].align ?? "left" });
        x += columns[i].width;
      });
      this.doc.y = y + h + 2;
      return h;
    };
    const header = () => {
      this.room(size * 4);
      drawRow(
        columns.map((c) => c.title),
        "bold",
      );
      const y = this.doc.y - 1;
      this.rule(y, 0.4);
      this.doc.y = y + 2;
    };
    header();
    for (const row of rows) {
      this.doc.font("sans").fontSize(size);
      const h = Math.max(
        ...row.map((c, i) => this.doc.heightOfString(c, { width: columns[i].width - 4 })),
        size + 2,
      );
      if (this.doc.y + h > this.bottom) {
        this.doc.addPage();
        header();
      }
      drawRow(row, "sans");
    }
  }

  title(report: RunReport): void {
    const d = this.doc;
    d.font("bold")
      .fontSize(16)
      .fillColor(INK)
      .text("Emission spectrum screening report", MARGIN.left, MARGIN.top, {
        width: CONTENT_WIDTH,
      });
    d.font("sans").fontSize(10).fillColor(INK).text(report.title, { width: CONTENT_WIDTH });
    d.moveDown(0.3);
    d.font("sans")
      .fontSize(9)
      .fillColor(MUTED)
      .text(
        `Notebook: ${report.notebookTitle} · author: ${report.authorName ?? "unknown"} · instrument: ${report.instrumentName} · ` +
          `source: ${report.source} · analysed ${formatUtc(report.createdAt)} · status: ${report.status} · version ${report.versionNumber}`,
        { width: CONTENT_WIDTH },
      );
    const present = report.calls.filter((c) => c.verdict === "present").map((c) => c.species);
    const possible = report.calls.filter((c) => c.verdict === "possible").map((c) => c.species);
    d.moveDown(0.4);
    d.font("bold")
      .fontSize(10)
      .fillColor(INK)
      .text(`Called present: ${present.length ? present.join(", ") : "none"}`, {
        width: CONTENT_WIDTH,
      });
    d.font("sans")
      .fontSize(10)
      .text(`Possible: ${possible.length ? possible.join(", ") : "none"}`, {
        width: CONTENT_WIDTH,
      });
  }

  notice(report: RunReport): void {
    const d = this.doc;
    d.moveDown(0.5);
    const boxTop = d.y;
    const lines = [report.caveat, ...report.warnings.map((w) => `Warning: ${w}`)];
    d.font("sans").fontSize(9);
    const h =
      lines.reduce((sum, l) => sum + d.heightOfString(l, { width: CONTENT_WIDTH - 12 }) + 2, 0) + 8;
    d.rect(MARGIN.left, boxTop, CONTENT_WIDTH, h).lineWidth(0.8).strokeColor(EMBER).stroke();
    d.y = boxTop + 5;
    lines.forEach((l, i) =>
      d
        .font(i === 0 ? "bold" : "sans")
        .fillColor(INK)
        .text(l, MARGIN.left + 6, d.y, { width: CONTENT_WIDTH - 12 }),
    );
    d.y = boxTop + h + 4;
    if (report.flameCautions) {
      this.paragraph("Flame test cautions", { font: "bold", color: EMBER });
      for (const c of report.flameCautions) this.paragraph(`– ${c}`, { indent: 8 });
    }
  }

  chart(report: RunReport, spectrum: RenderReportPdfOptions["spectrum"]): void {
    this.heading("Calibrated spectrum");
    if (spectrum.wavelengthNm.length < 2) {
      this.paragraph("The spectrum has too few points to draw.", { color: MUTED });
      return;
    }
    const height = 250;
    this.room(height + 30);
    const d = this.doc;
    const top = d.y;
    const g = chartGeometry(
      spectrum.wavelengthNm,
      spectrum.counts,
      chartLabelsFromCalls(report.calls),
      {
        width: CONTENT_WIDTH,
        height,
        fontSize: 7,
      },
    );
    d.save();
    d.translate(MARGIN.left, top);
    const { plot } = g;
    d.rect(plot.left, plot.top, plot.right - plot.left, plot.bottom - plot.top)
      .lineWidth(0.6)
      .strokeColor(INK)
      .stroke();
    d.font("sans").fontSize(7).fillColor(INK);
    for (const t of g.xTicks) {
      d.moveTo(t.at, plot.bottom)
        .lineTo(t.at, plot.bottom + 3)
        .lineWidth(0.5)
        .strokeColor(INK)
        .stroke();
      d.text(t.text, t.at - 20, plot.bottom + 4, { width: 40, align: "center", lineBreak: false });
    }
    for (const t of g.yTicks) {
      d.moveTo(plot.left - 3, t.at)
        .lineTo(plot.left, t.at)
        .lineWidth(0.5)
        .strokeColor(INK)
        .stroke();
      d.text(t.text, plot.left - 40, t.at - 3, { width: 36, align: "right", lineBreak: false });
    }
    d.text(g.xTitle, plot.left, plot.bottom + 14, {
      width: plot.right - plot.left,
      align: "center",
      lineBreak: false,
    });
    d.save();
    d.rotate(-90, { origin: [8, (plot.top + plot.bottom) / 2] });
    d.text(g.yTitle, 8 - 40, (plot.top + plot.bottom) / 2 - 4, {
      width: 80,
      align: "center",
      lineBreak: false,
    });
    d.restore();
    // The trace, clipped to the plot area.
    d.save();
    d.rect(plot.left, plot.top, plot.right - plot.left, plot.bottom - plot.top).clip();
    d.moveTo(g.trace[0][0], g.trace[0][1]);
    for (let i = 1; i < g.trace.length; i++) d.lineTo(g.trace[i][0], g.trace[i][1]);
    d.lineWidth(0.5).strokeColor("#0072b2").stroke();
    d.restore();
    for (const l of g.labels) {
      const color = l.verdict === "present" ? EMBER : MUTED;
      d.moveTo(l.peakX, l.textY + 8)
        .lineTo(l.peakX, Math.max(l.peakY - 2, l.textY + 8))
        .lineWidth(0.4)
        .dash(1.5, { space: 1.5 })
        .strokeColor(color)
        .stroke()
        .undash();
      d.font(l.verdict === "present" ? "bold" : "sans")
        .fontSize(7)
        .fillColor(color)
        .text(l.verdict === "present" ? l.text : `${l.text}?`, l.textX, l.textY, {
          lineBreak: false,
        });
    }
    d.restore();
    d.y = top + height;
    this.paragraph(
      "Labels: lines of species called present in bold; lines of possible species marked “?”. Counts as recorded, on the run's wavelength axis" +
        (report.lampChecked
          ? " (air wavelengths from the lamp calibration)."
          : " (the file's own axis, not lamp-checked).") +
        (g.unplaced.length ? ` Not labelled for want of room: ${g.unplaced.join("; ")}.` : ""),
      { size: 7.5, color: MUTED },
    );
  }

  calls(report: RunReport): void {
    this.heading("Calls");
    if (report.calls.length === 0) {
      this.paragraph("No element is called present or possible.", { color: MUTED });
    } else {
      this.table(
        [
          { title: "Species", width: 70 },
          { title: "Verdict", width: 70 },
          { title: "Computed", width: 65 },
          { title: "Score", width: 50, align: "right" },
          { title: "Lines seen", width: 60, align: "right" },
          { title: "Missing (strong)", width: 80, align: "right" },
          { title: "Override", width: CONTENT_WIDTH - 395 },
        ],
        report.calls.map((c) => [
          c.species,
          c.verdict,
          c.computedVerdict,
          c.score.toFixed(2),
          String(c.seenCount),
          `${c.missingCount} (${c.missingStrongCount})`,
          c.override ? overrideText(c) : "",
        ]),
        8.5,
      );
    }
    if (report.absentSpecies.length) {
      this.doc.moveDown(0.3);
      this.paragraph(
        `Candidates not supported by the spectrum (absent): ${report.absentSpecies.join(", ")}.`,
        { size: 8, color: MUTED },
      );
      const limits = detectionLimitsSentence(report.absentLimits);
      if (limits) this.paragraph(limits, { size: 8, color: MUTED });
    }
    for (const call of report.calls) this.evidence(call);
  }

  private evidence(call: ReportCall): void {
    this.heading(`Evidence: ${call.species} (${call.verdict})`);
    this.paragraph(call.rationale, { size: 8.5 });
    if (call.override)
      this.paragraph(`Override: ${overrideText(call)}`, { size: 8.5, color: EMBER });
    for (const n of call.notes) this.paragraph(`Note: ${n}`, { size: 8, color: MUTED });
    this.paragraph(`Intensities: ${call.intensityBasis}`, { size: 8, color: MUTED });
    this.doc.moveDown(0.2);
    if (call.lines.length) {
      this.table(
        [
          { title: "Line (nm)", width: 90, align: "right" },
          { title: "Peak (nm)", width: 90, align: "right" },
          { title: "Δλ (nm)", width: 80, align: "right" },
          { title: "Rel. intensity", width: 90, align: "right" },
        ],
        call.lines.map((l) => [
          l.lineNm.toFixed(4),
          l.peakNm.toFixed(4),
          signed(l.deltaNm, 4),
          l.relativeIntensity === null ? "–" : String(l.relativeIntensity),
        ]),
      );
    } else this.paragraph("No line seen.", { size: 8, color: MUTED });
    const missing = call.missing.filter((m) => !m.hidden);
    if (missing.length) {
      this.paragraph(
        `Expected but not seen: ${missing
          .slice(0, 12)
          .map(
            (m) =>
              `${m.lineNm.toFixed(3)} nm${m.predictedSnr !== null ? ` (predicted SNR ${m.predictedSnr.toFixed(1)})` : ""}`,
          )
          .join(", ")}${missing.length > 12 ? `, and ${missing.length - 12} more` : ""}.`,
        { size: 8 },
      );
    }
    if (call.overlaps.length) {
      this.paragraph(
        `Shared peaks: ${call.overlaps.map((o) => `${o.peakNm.toFixed(3)} nm with ${o.otherSpecies.join(", ")}`).join("; ")}.`,
        { size: 8 },
      );
    }
  }

  unexplained(report: RunReport): void {
    this.heading("Unexplained peaks");
    if (report.unexplained.length === 0) {
      this.paragraph(
        `Every one of the ${report.peakCount} peaks above the threshold has a candidate line.`,
        { color: MUTED },
      );
      return;
    }
    this.table(
      [
        { title: "Peak (nm)", width: 90, align: "right" },
        { title: "SNR", width: 60, align: "right" },
        { title: "Reason", width: CONTENT_WIDTH - 150 },
      ],
      report.unexplained.map((u) => [u.wavelengthNm.toFixed(3), u.snr.toFixed(1), u.reason]),
    );
  }

  calibration(report: RunReport): void {
    this.heading("Calibration");
    const c = report.calibration;
    if (!c) {
      this.paragraph("None: the run used the file's own wavelength axis (not lamp-checked).");
    } else {
      this.fields(calibrationFields(c, report));
    }
    this.heading("Line-table release");
    this.fields(releaseFields(report.release));
    if (report.temperature) {
      this.heading("Excitation temperature");
      const t = report.temperature;
      this.paragraph(
        t.ok
          ? `${t.temperatureK.toFixed(0)} ± ${t.temperatureUncertaintyK.toFixed(0)} K from ${t.lineCount} ${t.species} lines (Boltzmann plot, R² ${t.rSquared.toFixed(3)}).`
          : `Not determined: ${t.message}`,
      );
    }
  }

  settingsAndProvenance(report: RunReport): void {
    this.heading("Settings");
    this.fields(report.settings);
    this.heading("Made from");
    this.fields(report.provenance, true);
    if (report.notes.trim()) {
      this.heading("Notes");
      this.paragraph(report.notes);
    }
  }

  review(report: RunReport): void {
    this.heading("Review and signature");
    if (report.rounds.length) {
      this.table(
        [
          { title: "Round", width: 40 },
          { title: "Submitted", width: 120 },
          { title: "Decision", width: 130 },
          { title: "Comment", width: CONTENT_WIDTH - 290 },
        ],
        report.rounds.map((r) => [
          String(r.round),
          `${r.submittedByName ?? "unknown"}, ${formatUtc(r.submittedAt)}`,
          r.decision
            ? `${r.decision} by ${r.decidedByName ?? "unknown"}${r.decidedAt ? `, ${formatUtc(r.decidedAt)}` : ""}`
            : "pending",
          r.comment,
        ]),
      );
      this.doc.moveDown(0.4);
    } else this.paragraph("Not submitted for review.", { color: MUTED });
    const s = report.signature;
    if (s) {
      this.fields(signatureFields(s));
      this.fields([{ label: "Content hash (SHA-256)", value: s.contentHash }], true);
    } else {
      this.paragraph("Not signed.", { color: MUTED });
    }
  }

  headersAndFooters(report: RunReport): void {
    const d = this.doc;
    const range = d.bufferedPageRange();
    for (let i = range.start; i < range.start + range.count; i++) {
      d.switchToPage(i);
      // Writing in the margins: lift the bottom margin so pdfkit does not start a new page.
      const bottomMargin = d.page.margins.bottom;
      d.page.margins.bottom = 0;
      d.font("sans").fontSize(7.5).fillColor(MUTED);
      d.text(
        `Emberline · run ${report.shortId} v${report.versionNumber} · ${report.status}`,
        MARGIN.left,
        28,
        {
          width: CONTENT_WIDTH / 2,
          lineBreak: false,
        },
      );
      d.text(`Made ${formatUtc(report.generatedAt)}`, MARGIN.left + CONTENT_WIDTH / 2, 28, {
        width: CONTENT_WIDTH / 2,
        align: "right",
        lineBreak: false,
      });
      this.rule(40, 0.4);
      const footY = PAGE.height - 44;
      this.rule(footY - 4, 0.4);
      d.text(report.caveat, MARGIN.left, footY, { width: CONTENT_WIDTH - 70 });
      d.text(
        `Page ${i - range.start + 1} of ${range.count}`,
        MARGIN.left + CONTENT_WIDTH - 70,
        footY,
        {
          width: 70,
          align: "right",
          lineBreak: false,
        },
      );
      d.page.margins.bottom = bottomMargin;
    }
  }
}

function overrideText(c: ReportCall): string {
  const o = c.override!;
  const what =
    o.verdict === null ? `withdrawn (back to ${c.computedVerdict})` : `set to ${o.verdict}`;
  return `${what} by ${o.byName ?? "unknown"}, ${formatUtc(o.at)}: ${o.reason}`;
}

function signed(v: number, digits: number): string {
  return `${v >= 0 ? "+" : "−"}${Math.abs(v).toFixed(digits)}`;
}
