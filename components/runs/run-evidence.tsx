// A run's calls with their evidence (the standing verdict in words and a shape, an override marked
// with who, why, when and the computed verdict, score, lines seen with Δλ, strong lines expected but
// missing, overlaps, an absent call's detection limit) and its peak table.
import type { ReactNode } from "react";
import { TableScroll } from "@/components/ui/table-scroll";
import { detectionLimitText } from "@/lib/reports/detection-limit-text";
import { formatWavelengthColumn, wavelengthColumnDecimals } from "@/lib/reports/wavelength-column";
import type { RunCall, RunPeak } from "@/lib/runs/types";

const VERDICT = {
  present: { mark: "●", label: "present", tone: "border-verdict-present text-verdict-present" },
  possible: { mark: "◐", label: "possible", tone: "border-verdict-possible text-verdict-possible" },
  absent: { mark: "○", label: "absent", tone: "border-verdict-absent text-verdict-absent" },
} as const;

export function VerdictBadge({ verdict }: { verdict: RunCall["verdict"] }) {
  const v = VERDICT[verdict];
  return (
    <span
      className={`inline-flex items-center gap-1 rounded border px-1.5 text-xs font-semibold dark:brightness-150 ${v.tone}`}
    >
      <span aria-hidden>{v.mark}</span>
      {v.label}
    </span>
  );
}

const ORDER = { present: 0, possible: 1, absent: 2 } as const;

/** "Overridden by … on …: reason (computed: …)", for a call whose verdict a chemist changed. */
export function OverrideNote({ call }: { call: RunCall }) {
  const o = call.override;
  if (!o) return null;
  return (
    <p
      className="mt-2 rounded border border-dashed border-ember-600 px-2 py-1 text-xs"
      data-testid="override-note"
    >
      <span className="font-semibold">
        <span aria-hidden>✎ </span>Overridden
      </span>{" "}
      by {o.byName ?? "a former member"} on {o.at.slice(0, 16).replace("T", " ")} UTC: “{o.reason}”
      · computed verdict: <VerdictBadge verdict={call.computedVerdict} />
    </p>
  );
}

export function CallEvidence({
  calls,
  peaks = [],
  overrideFormFor,
}: {
  calls: RunCall[];
  /** The run's peaks: the evidence's peak wavelengths take the peak table's precision. */
  peaks?: RunPeak[];
  /** The override form of one call, when the viewer may override (the run's author, while editable). */
  overrideFormFor?: (call: RunCall) => ReactNode;
}) {
  if (calls.length === 0)
    return <p className="muted text-sm">No element was a candidate for any peak.</p>;
  const sorted = [...calls].sort(
    (a, b) => ORDER[a.verdict] - ORDER[b.verdict] || b.score - a.score,
  );
  const called = sorted.filter((c) => c.verdict !== "absent");
  const peakDecimals = wavelengthColumnDecimals(peaks.map((p) => p.uncertaintyNm));
  const absent = sorted.filter((c) => c.verdict === "absent");
  return (
    <div className="flex flex-col gap-2" data-testid="calls">
      {called.length === 0 ? (
        <p className="muted text-sm">No element is called present or possible.</p>
      ) : null}
      {called.map((call) => (
        <details
          key={call.species}
          open={call.verdict !== "absent"}
          className="panel p-3"
          data-testid="call"
        >
          <summary className="flex cursor-pointer flex-wrap items-baseline gap-3">
            <span className="font-semibold" data-testid="call-species">
              {call.species}
            </span>
            <VerdictBadge verdict={call.verdict} />
            {call.override ? (
              <span className="text-xs font-semibold text-ember-800 dark:text-ember-200">
                <span aria-hidden>✎ </span>overridden (computed: {call.computedVerdict})
              </span>
            ) : null}
            <span className="font-mono text-xs">score {call.score.toFixed(2)}</span>
            <span className="muted text-xs">
              {call.seenCount} seen
              {call.seenPeaks !== undefined && call.seenPeaks < call.seenCount
                ? ` at ${call.seenPeaks} peak${call.seenPeaks === 1 ? "" : "s"}`
                : ""}{" "}
              · {call.missingCount} missing ({call.missingStrongCount} strong) · intensities:{" "}
              {call.intensityBasis}
            </span>
          </summary>
          <p className="mt-2 text-sm">{call.rationale}</p>
          <OverrideNote call={call} />
          <div className="mt-2 grid grid-cols-1 gap-3 md:grid-cols-2">
            <TableScroll label={`Lines of ${call.species} seen`}>
              <table className="text-sm">
                <caption className="text-left text-xs font-semibold">Lines seen</caption>
                <thead className="text-left text-xs">
                  <tr>
                    <th scope="col" className="pr-3">
                      Line (nm)
                    </th>
                    <th scope="col" className="pr-3">
                      Peak (nm)
                    </th>
                    <th scope="col" className="pr-3">
                      Δλ (nm)
                    </th>
                    <th scope="col">Rel. int.</th>
                  </tr>
                </thead>
                <tbody className="font-mono text-xs">
                  {call.lines.length === 0 ? (
                    <tr>
                      <td colSpan={4} className="muted font-sans">
                        none
                      </td>
                    </tr>
                  ) : (
                    call.lines.map((l, i) => (
                      <tr key={l.lineId}>
                        <td className="pr-3">{l.lineNm.toFixed(3)}</td>
                        <td className="pr-3">
                          {i > 0 && call.lines[i - 1].peakNm === l.peakNm ? (
                            <span className="font-sans" data-testid="same-peak">
                              ↳ same peak{" "}
                              <span className="sr-only">
                                (blended with the line above: one piece of evidence)
                              </span>
                            </span>
                          ) : (
                            l.peakNm.toFixed(peakDecimals)
                          )}
                        </td>
                        <td className="pr-3">
                          {l.deltaNm >= 0 ? "+" : ""}
                          {l.deltaNm.toFixed(peakDecimals)}
                        </td>
                        <td>
                          {l.relativeIntensity === null ? "—" : twoDigits(l.relativeIntensity)}
                        </td>
                      </tr>
                    ))
                  )}
                </tbody>
              </table>
            </TableScroll>
            <TableScroll label={`Lines of ${call.species} expected but missing`}>
              <table className="text-sm">
                <caption className="text-left text-xs font-semibold">Expected but missing</caption>
                <thead className="text-left text-xs">
                  <tr>
                    <th scope="col" className="pr-3">
                      Line (nm)
                    </th>
                    <th scope="col" className="pr-3">
                      Rel. int.
                    </th>
                    <th scope="col">Note</th>
                  </tr>
                </thead>
                <tbody className="font-mono text-xs">
                  {call.missing.length === 0 ? (
                    <tr>
                      <td colSpan={3} className="muted font-sans">
                        none
                      </td>
                    </tr>
                  ) : (
                    call.missing.map((m) => (
                      <tr key={m.lineId}>
                        <td className="pr-3">{m.lineNm.toFixed(3)}</td>
                        <td className="pr-3">{twoDigits(m.relativeIntensity)}</td>
                        <td className="font-sans">
                          {m.hidden
                            ? "under another peak"
                            : m.predictedSnr !== null
                              ? `predicted SNR ${m.predictedSnr.toFixed(1)}`
                              : ""}
                        </td>
                      </tr>
                    ))
                  )}
                </tbody>
              </table>
            </TableScroll>
          </div>
          {call.overlaps.length > 0 ? (
            <p className="mt-2 text-xs">
              Overlaps:{" "}
              {call.overlaps
                .map((o) => `${o.peakNm.toFixed(2)} nm shared with ${o.otherSpecies.join(", ")}`)
                .join("; ")}
            </p>
          ) : null}
          {call.notes.length > 0 ? (
            <ul className="muted mt-1 list-disc pl-5 text-xs">
              {call.notes.map((n) => (
                <li key={n}>{n}</li>
              ))}
            </ul>
          ) : null}
          {overrideFormFor ? overrideFormFor(call) : null}
        </details>
      ))}
      {absent.length > 0 ? <AbsentCalls calls={absent} overrideFormFor={overrideFormFor} /> : null}
    </div>
  );
}

/** Species weighed and called absent: one compact table, since most of a table's elements end here. */
function AbsentCalls({
  calls,
  overrideFormFor,
}: {
  calls: RunCall[];
  overrideFormFor?: (call: RunCall) => ReactNode;
}) {
  return (
    <details className="panel p-3" data-testid="absent-calls">
      <summary className="cursor-pointer text-sm">
        <VerdictBadge verdict="absent" />{" "}
        <span className="font-semibold">{calls.length} species called absent</span>{" "}
        <span className="muted text-xs">{calls.map((c) => c.species).join(", ")}</span>
      </summary>
      <TableScroll label="Species called absent" className="mt-2">
        <table className="w-full text-sm">
          <caption className="sr-only">Species called absent</caption>
          <thead className="text-left text-xs">
            <tr>
              <th scope="col" className="pr-3">
                Species
              </th>
              <th scope="col" className="pr-3 text-right">
                Score
              </th>
              <th scope="col" className="pr-3 text-right">
                Lines seen
              </th>
              <th scope="col" className="pr-3 text-right">
                Strong lines missing
              </th>
              <th scope="col" className="pr-3">
                Detection limit{" "}
                <span className="sr-only">
                  (least height its strongest line needed to be found)
                </span>
              </th>
              <th scope="col">Why</th>
            </tr>
          </thead>
          <tbody className="text-xs">
            {calls.map((c) => (
              <tr key={c.species} className="border-t border-[var(--line)]">
                <td className="pr-3 font-semibold">
                  {c.species}
                  {c.override ? (
                    <span className="block font-normal text-ember-800 dark:text-ember-200">
                      ✎ overridden (computed: {c.computedVerdict})
                    </span>
                  ) : null}
                </td>
                <td className="pr-3 text-right font-mono">{c.score.toFixed(2)}</td>
                <td className="pr-3 text-right font-mono">{c.seenCount}</td>
                <td className="pr-3 text-right font-mono">{c.missingStrongCount}</td>
                <td className="pr-3" data-testid="detection-limit">
                  {detectionLimitText(c.detectionLimit)}
                </td>
                <td>
                  <span className="muted">{c.rationale}</span>
                  <OverrideNote call={c} />
                  {overrideFormFor ? overrideFormFor(c) : null}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </TableScroll>
    </details>
  );
}

export function PeakTable({ peaks }: { peaks: RunPeak[] }) {
  // One precision for the whole column, from the peaks' centre uncertainties.
  const column = formatWavelengthColumn(peaks);
  return (
    <TableScroll label="Peaks" className="panel max-h-96 overflow-y-auto">
      <table className="w-full text-sm" data-testid="peaks-table">
        <caption className="sr-only">Peaks found in the sample</caption>
        <thead className="sticky top-0 border-b border-[var(--line)] bg-[var(--panel)] text-left">
          <tr>
            <th scope="col" className="px-3 py-1.5 text-right">
              λ (nm)
            </th>
            <th scope="col" className="px-3 py-1.5 text-right">
              ± (nm)
            </th>
            <th scope="col" className="px-3 py-1.5 text-right">
              FWHM (nm)
            </th>
            <th scope="col" className="px-3 py-1.5 text-right">
              Height
            </th>
            <th scope="col" className="px-3 py-1.5 text-right">
              SNR
            </th>
            <th scope="col" className="px-3 py-1.5">
              Flags
            </th>
          </tr>
        </thead>
        <tbody className="font-mono text-xs">
          {peaks.map((p, i) => (
            <tr key={p.x} className="border-b border-[var(--line)] last:border-0">
              <td className="px-3 py-1 text-right">{column.wavelengths[i]}</td>
              <td className="px-3 py-1 text-right">{column.uncertainties[i]}</td>
              <td className="px-3 py-1 text-right">{p.fwhmNm.toFixed(2)}</td>
              <td className="px-3 py-1 text-right">{p.height.toFixed(0)}</td>
              <td className="px-3 py-1 text-right">{p.snr.toFixed(1)}</td>
              <td className="px-3 py-1 font-sans">
                {[p.saturated ? "saturated" : "", p.blended ? "blended" : ""]
                  .filter(Boolean)
                  .join(", ")}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </TableScroll>
  );
}

/** A relative intensity to two significant digits: table intensities are rough to a factor of two. */
function twoDigits(value: number): string {
  return Number.isFinite(value) ? String(Number(value.toPrecision(2))) : "—";
}
