// The printable report of a run: the same content as the PDF (lib/reports builds both from one
// model), laid out for A4 with print styles that hide the workspace navigation.
import type { ReactNode } from "react";
import type { ChartGeometry } from "@/lib/reports/chart-geometry";
import { detectionLimitsSentence } from "@/lib/reports/detection-limit-text";
import { calibrationFields, releaseFields, signatureFields } from "@/lib/reports/report-fields";
import {
  formatUtc,
  type ReportCall,
  type ReportField,
  type RunReport,
} from "@/lib/reports/report-model";
import { ReportChart } from "./report-chart";

export const REPORT_CHART_SIZE = { width: 700, height: 300 };

function Section({
  title,
  children,
  testId,
}: {
  title: string;
  children: ReactNode;
  testId?: string;
}) {
  return (
    <section className="mt-5 break-inside-avoid-page" data-testid={testId}>
      <h2 className="mb-1.5 border-b border-[var(--line)] pb-0.5 text-base font-semibold">
        {title}
      </h2>
      {children}
    </section>
  );
}

function Fields({ fields, mono = false }: { fields: ReportField[]; mono?: boolean }) {
  return (
    <dl className="grid grid-cols-[10rem_1fr] gap-x-4 gap-y-0.5 text-sm">
      {fields.map((f) => (
        <div key={f.label} className="contents">
          <dt className="muted">{f.label}</dt>
          <dd className={mono ? "break-all font-mono text-xs leading-5" : ""}>{f.value}</dd>
        </div>
      ))}
    </dl>
  );
}

function overrideText(c: ReportCall): string {
  const o = c.override!;
  const what =
    o.verdict === null ? `withdrawn (back to ${c.computedVerdict})` : `set to ${o.verdict}`;
  return `${what} by ${o.byName ?? "unknown"}, ${formatUtc(o.at)}: ${o.reason}`;
}

const signed = (v: number) => `${v >= 0 ? "+" : "−"}${Math.abs(v).toFixed(4)}`;

export function RunReportView({ report, chart }: { report: RunReport; chart: ChartGeometry }) {
  const present = report.calls.filter((c) => c.verdict === "present").map((c) => c.species);
  const possible = report.calls.filter((c) => c.verdict === "possible").map((c) => c.species);
  const limitsSentence = detectionLimitsSentence(report.absentLimits);
  const c = report.calibration;
  return (
    <article className="report mx-auto max-w-[210mm] text-[var(--text)]" data-testid="run-report">
      <header>
        <p className="muted text-xs">
          Emberline · run {report.shortId} v{report.versionNumber} · {report.status} · made{" "}
          {formatUtc(report.generatedAt)}
        </p>
        <h1 className="mt-1 text-2xl font-semibold tracking-tight">
          Emission spectrum screening report
        </h1>
        <p className="text-sm">{report.title}</p>
        <p className="muted mt-1 text-sm">
          Notebook: {report.notebookTitle} · author: {report.authorName ?? "unknown"} · instrument:{" "}
          {report.instrumentName} · source: {report.source} · analysed {formatUtc(report.createdAt)}
        </p>
        <p className="mt-2 font-semibold">
          Called present: {present.length ? present.join(", ") : "none"}
        </p>
        <p>Possible: {possible.length ? possible.join(", ") : "none"}</p>
      </header>

      <div className="mt-3 rounded border border-ember-600 p-2 text-sm" data-testid="report-caveat">
        <p className="font-semibold">{report.caveat}</p>
        {report.warnings.map((w) => (
          <p key={w} role="note">
            <span aria-hidden>⚠ </span>Warning: {w}
          </p>
        ))}
      </div>
      {report.flameCautions ? (
        <aside
          aria-label="Flame safety"
          className="mt-2 rounded border border-ember-600 p-2 text-sm"
        >
          <p className="font-semibold">
            <span aria-hidden>⚠ </span>Flame test cautions
          </p>
          <ul className="list-disc pl-5">
            {report.flameCautions.map((t) => (
              <li key={t}>{t}</li>
            ))}
          </ul>
        </aside>
      ) : null}

      <Section title="Calibrated spectrum">
        <ReportChart
          geometry={chart}
          {...REPORT_CHART_SIZE}
          caption={
            "Labels: lines of species called present in bold; lines of possible species marked “?”. Counts as recorded, on the run's wavelength axis" +
            (report.lampChecked
              ? " (air wavelengths from the lamp calibration)."
              : " (the file's own axis, not lamp-checked).") +
            (chart.unplaced.length
              ? ` Not labelled for want of room: ${chart.unplaced.join("; ")}.`
              : "")
          }
        />
      </Section>

      <Section title="Calls" testId="report-calls">
        {report.calls.length === 0 ? (
          <p className="muted text-sm">No element is called present or possible.</p>
        ) : (
          <table className="w-full text-sm">
            <thead className="text-left">
              <tr>
                <th scope="col" className="pr-2">
                  Species
                </th>
                <th scope="col" className="pr-2">
                  Verdict
                </th>
                <th scope="col" className="pr-2">
                  Computed
                </th>
                <th scope="col" className="pr-2 text-right">
                  Score
                </th>
                <th scope="col" className="pr-2 text-right">
                  Seen
                </th>
                <th scope="col" className="pr-2 text-right">
                  Missing (strong)
                </th>
                <th scope="col">Override</th>
              </tr>
            </thead>
            <tbody>
              {report.calls.map((call) => (
                <tr key={call.species} className="border-t border-[var(--line)] align-top">
                  <td className="pr-2 font-medium">{call.species}</td>
                  <td className="pr-2">{call.verdict}</td>
                  <td className="pr-2">{call.computedVerdict}</td>
                  <td className="pr-2 text-right font-mono text-xs">{call.score.toFixed(2)}</td>
                  <td className="pr-2 text-right">{call.seenCount}</td>
                  <td className="pr-2 text-right">
                    {call.missingCount} ({call.missingStrongCount})
                  </td>
                  <td className="text-xs">{call.override ? overrideText(call) : ""}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
        {report.absentSpecies.length ? (
          <p className="muted mt-1 text-xs">
            Candidates not supported by the spectrum (absent): {report.absentSpecies.join(", ")}.
          </p>
        ) : null}
        {limitsSentence ? (
          <p className="muted mt-1 text-xs" data-testid="detection-limits">
            {limitsSentence}
          </p>
        ) : null}
      </Section>

      {report.calls.map((call) => (
        <Section key={call.species} title={`Evidence: ${call.species} (${call.verdict})`}>
          <p className="text-sm">{call.rationale}</p>
          {call.override ? (
            <p className="text-sm text-ember-800 dark:text-ember-200">
              Override: {overrideText(call)}
            </p>
          ) : null}
          {call.notes.map((n) => (
            <p key={n} className="muted text-xs">
              Note: {n}
            </p>
          ))}
          <p className="muted text-xs">Intensities: {call.intensityBasis}</p>
          {call.lines.length ? (
            <table className="mt-1 text-sm">
              <thead>
                <tr>
                  <th scope="col" className="pr-4 text-right">
                    Line (nm)
                  </th>
                  <th scope="col" className="pr-4 text-right">
                    Peak (nm)
                  </th>
                  <th scope="col" className="pr-4 text-right">
                    Δλ (nm)
                  </th>
                  <th scope="col" className="text-right">
                    Rel. intensity
                  </th>
                </tr>
              </thead>
              <tbody className="font-mono text-xs">
                {call.lines.map((l) => (
                  <tr key={l.lineId + l.peakNm}>
                    <td className="pr-4 text-right">{l.lineNm.toFixed(4)}</td>
                    <td className="pr-4 text-right">{l.peakNm.toFixed(4)}</td>
                    <td className="pr-4 text-right">{signed(l.deltaNm)}</td>
                    <td className="text-right">{l.relativeIntensity ?? "–"}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          ) : (
            <p className="muted text-xs">No line seen.</p>
          )}
          {call.missing.filter((m) => !m.hidden).length ? (
            <p className="mt-1 text-xs">
              Expected but not seen:{" "}
              {call.missing
                .filter((m) => !m.hidden)
                .slice(0, 12)
                .map(
                  (m) =>
                    `${m.lineNm.toFixed(3)} nm${m.predictedSnr !== null ? ` (predicted SNR ${m.predictedSnr.toFixed(1)})` : ""}`,
                )
                .join(", ")}
              {call.missing.filter((m) => !m.hidden).length > 12
                ? `, and ${call.missing.filter((m) => !m.hidden).length - 12} more`
                : ""}
              .
            </p>
          ) : null}
          {call.overlaps.length ? (
            <p className="mt-1 text-xs">
              Shared peaks:{" "}
              {call.overlaps
                .map((o) => `${o.peakNm.toFixed(3)} nm with ${o.otherSpecies.join(", ")}`)
                .join("; ")}
              .
            </p>
          ) : null}
        </Section>
      ))}

      <Section title="Unexplained peaks">
        {report.unexplained.length === 0 ? (
          <p className="muted text-sm">
            Every one of the {report.peakCount} peaks above the threshold has a candidate line.
          </p>
        ) : (
          <ul className="text-sm">
            {report.unexplained.map((u) => (
              <li key={u.wavelengthNm}>
                <span className="font-mono text-xs">
                  {u.wavelengthNm.toFixed(3)} nm · SNR {u.snr.toFixed(1)}
                </span>{" "}
                <span className="muted">{u.reason}</span>
              </li>
            ))}
          </ul>
        )}
      </Section>

      <Section title="Calibration" testId="report-calibration">
        {c ? (
          <Fields fields={calibrationFields(c, report)} />
        ) : (
          <p className="text-sm">
            None: the run used the file&apos;s own wavelength axis (not lamp-checked).
          </p>
        )}
      </Section>

      <Section title="Line-table release">
        <Fields fields={releaseFields(report.release)} />
      </Section>

      {report.temperature ? (
        <Section title="Excitation temperature">
          <p className="text-sm">
            {report.temperature.ok
              ? `${report.temperature.temperatureK.toFixed(0)} ± ${report.temperature.temperatureUncertaintyK.toFixed(0)} K from ${report.temperature.lineCount} ${report.temperature.species} lines (Boltzmann plot, R² ${report.temperature.rSquared.toFixed(3)}).`
              : `Not determined: ${report.temperature.message}`}
          </p>
        </Section>
      ) : null}

      <Section title="Settings">
        <Fields fields={report.settings} />
      </Section>
      <Section title="Made from">
        <Fields fields={report.provenance} mono />
      </Section>
      {report.notes.trim() ? (
        <Section title="Notes">
          <p className="whitespace-pre-wrap text-sm">{report.notes}</p>
        </Section>
      ) : null}

      <Section title="Review and signature" testId="report-signature">
        {report.rounds.length ? (
          <table className="w-full text-sm">
            <thead className="text-left">
              <tr>
                <th scope="col" className="pr-2">
                  Round
                </th>
                <th scope="col" className="pr-2">
                  Submitted
                </th>
                <th scope="col" className="pr-2">
                  Decision
                </th>
                <th scope="col">Comment</th>
              </tr>
            </thead>
            <tbody>
              {report.rounds.map((r) => (
                <tr key={r.round} className="border-t border-[var(--line)] align-top">
                  <td className="pr-2">{r.round}</td>
                  <td className="pr-2">
                    {r.submittedByName ?? "unknown"}, {formatUtc(r.submittedAt)}
                  </td>
                  <td className="pr-2">
                    {r.decision
                      ? `${r.decision} by ${r.decidedByName ?? "unknown"}${r.decidedAt ? `, ${formatUtc(r.decidedAt)}` : ""}`
                      : "pending"}
                  </td>
                  <td>{r.comment}</td>
                </tr>
              ))}
            </tbody>
          </table>
        ) : (
          <p className="muted text-sm">Not submitted for review.</p>
        )}
        {report.signature ? (
          <div className="mt-2">
            <Fields fields={signatureFields(report.signature)} />
            <Fields
              fields={[{ label: "Content hash (SHA-256)", value: report.signature.contentHash }]}
              mono
            />
          </div>
        ) : (
          <p className="muted text-sm">Not signed.</p>
        )}
      </Section>
    </article>
  );
}

/** A CSS string literal (the caveat and run label go into the printed page's margin boxes). */
function cssString(text: string): string {
  return `"${text
    .replace(/\\/g, "\\\\")
    .replace(/"/g, '\\"')
    .replace(/[\r\n]+/g, " ")}"`;
}

/** The print rules of the printable page: A4, light colours, no workspace navigation, and in every
 * page's margins the run, the screening caveat and the page number (CSS page margin boxes). */
export function reportPrintCss(report: RunReport): string {
  return `
@page {
  size: A4;
  margin: 16mm 14mm 20mm;
  @top-left { content: ${cssString(`Emberline · run ${report.shortId} v${report.versionNumber} · ${report.status}`)}; font: 8pt sans-serif; color: #444; }
  @bottom-left { content: ${cssString(report.caveat)}; font: 7.5pt sans-serif; color: #444; }
  @bottom-right { content: "Page " counter(page) " of " counter(pages); font: 7.5pt sans-serif; color: #444; }
}
@media print {
  :root, .dark { color-scheme: light; --surface: #fff; --panel: #fff; --text: #000; --muted: #444; --line: #bbb; }
  body > div > aside, .report-toolbar { display: none !important; }
  main { padding: 0 !important; }
  .report { max-width: none; }
}
`;
}
