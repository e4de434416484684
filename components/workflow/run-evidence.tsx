// A run's calls with their evidence (verdict in words and a shape, score, lines seen with Δλ, strong
// lines expected but missing, overlaps) and its peak table.
import type { RunCall, RunPeak } from "@/lib/services/workflow-types";

const VERDICT = {
  present: { mark: "●", label: "present", tone: "border-verdict-present text-verdict-present" },
  possible: { mark: "◐", label: "possible", tone: "border-verdict-possible text-verdict-possible" },
  absent: { mark: "○", label: "absent", tone: "border-verdict-absent text-verdict-absent" },
} as const;

export function VerdictBadge({ verdict }: { verdict: RunCall["verdict"] }) {
  const v = VERDICT[verdict];
  return (
    <span className={`inline-flex items-center gap-1 rounded border px-1.5 text-xs font-semibold dark:brightness-150 ${v.tone}`}>
      <span aria-hidden>{v.mark}</span>
      {v.label}
    </span>
  );
}

const ORDER = { present: 0, possible: 1, absent: 2 } as const;

export function CallEvidence({ calls }: { calls: RunCall[] }) {
  if (calls.length === 0) return <p className="muted text-sm">No element was a candidate for any peak.</p>;
  const sorted = [...calls].sort((a, b) => ORDER[a.verdict] - ORDER[b.verdict] || b.score - a.score);
  const called = sorted.filter((c) => c.verdict !== "absent");
  const absent = sorted.filter((c) => c.verdict === "absent");
  return (
    <div className="flex flex-col gap-2" data-testid="calls">
      {called.length === 0 ? <p className="muted text-sm">No element is called present or possible.</p> : null}
      {called.map((call) => (
        <details key={call.species} open={call.verdict !== "absent"} className="panel p-3" data-testid="call">
          <summary className="flex cursor-pointer flex-wrap items-baseline gap-3">
            <span className="font-semibold" data-testid="call-species">
              {call.species}
            </span>
            <VerdictBadge verdict={call.verdict} />
            <span className="font-mono text-xs">score {call.score.toFixed(2)}</span>
            <span className="muted text-xs">
              {call.seenCount} seen · {call.missingCount} missing ({call.missingStrongCount} strong) · intensities: {call.intensityBasis}
            </span>
          </summary>
          <p className="mt-2 text-sm">{call.rationale}</p>
          <div className="mt-2 grid gap-3 md:grid-cols-2">
            <table className="text-sm">
              <caption className="text-left text-xs font-semibold">Lines seen</caption>
              <thead className="text-left text-xs">
                <tr>
                  <th scope="col" className="pr-3">Line (nm)</th>
                  <th scope="col" className="pr-3">Peak (nm)</th>
                  <th scope="col" className="pr-3">Δλ (nm)</th>
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
                  call.lines.map((l) => (
                    <tr key={l.lineId}>
                      <td className="pr-3">{l.lineNm.toFixed(3)}</td>
                      <td className="pr-3">{l.peakNm.toFixed(3)}</td>
                      <td className="pr-3">{l.deltaNm >= 0 ? "+" : ""}{l.deltaNm.toFixed(3)}</td>
                      <td>{l.relativeIntensity ?? "—"}</td>
                    </tr>
                  ))
                )}
              </tbody>
            </table>
            <table className="text-sm">
              <caption className="text-left text-xs font-semibold">Expected but missing</caption>
              <thead className="text-left text-xs">
                <tr>
                  <th scope="col" className="pr-3">Line (nm)</th>
                  <th scope="col" className="pr-3">Rel. int.</th>
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
                      <td className="pr-3">{m.relativeIntensity}</td>
                      <td className="font-sans">
                        {m.hidden ? "under another peak" : m.predictedSnr !== null ? `predicted SNR ${m.predictedSnr.toFixed(1)}` : ""}
                      </td>
                    </tr>
                  ))
                )}
              </tbody>
            </table>
          </div>
          {call.overlaps.length > 0 ? (
            <p className="mt-2 text-xs">
              Overlaps:{" "}
              {call.overlaps.map((o) => `${o.peakNm.toFixed(2)} nm shared with ${o.otherSpecies.join(", ")}`).join("; ")}
            </p>
          ) : null}
          {call.notes.length > 0 ? (
            <ul className="muted mt-1 list-disc pl-5 text-xs">
              {call.notes.map((n) => (
                <li key={n}>{n}</li>
              ))}
            </ul>
          ) : null}
        </details>
      ))}
      {absent.length > 0 ? <AbsentCalls calls={absent} /> : null}
    </div>
  );
}

/** Species weighed and called absent: one compact table, since most of a table's elements end here. */
function AbsentCalls({ calls }: { calls: RunCall[] }) {
  return (
    <details className="panel p-3" data-testid="absent-calls">
      <summary className="cursor-pointer text-sm">
        <VerdictBadge verdict="absent" /> <span className="font-semibold">{calls.length} species called absent</span>{" "}
        <span className="muted text-xs">{calls.map((c) => c.species).join(", ")}</span>
      </summary>
      <table className="mt-2 w-full text-sm">
        <caption className="sr-only">Species called absent</caption>
        <thead className="text-left text-xs">
          <tr>
            <th scope="col" className="pr-3">Species</th>
            <th scope="col" className="pr-3 text-right">Score</th>
            <th scope="col" className="pr-3 text-right">Lines seen</th>
            <th scope="col" className="pr-3 text-right">Strong lines missing</th>
            <th scope="col">Why</th>
          </tr>
        </thead>
        <tbody className="text-xs">
          {calls.map((c) => (
            <tr key={c.species} className="border-t border-[var(--line)]">
              <td className="pr-3 font-semibold">{c.species}</td>
              <td className="pr-3 text-right font-mono">{c.score.toFixed(2)}</td>
              <td className="pr-3 text-right font-mono">{c.seenCount}</td>
              <td className="pr-3 text-right font-mono">{c.missingStrongCount}</td>
              <td className="muted">{c.rationale}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </details>
  );
}

export function PeakTable({ peaks }: { peaks: RunPeak[] }) {
  return (
    <div className="panel max-h-96 overflow-auto">
      <table className="w-full text-sm" data-testid="peaks-table">
        <caption className="sr-only">Peaks found in the sample</caption>
        <thead className="sticky top-0 border-b border-[var(--line)] bg-[var(--panel)] text-left">
          <tr>
            <th scope="col" className="px-3 py-1.5 text-right">λ (nm)</th>
            <th scope="col" className="px-3 py-1.5 text-right">± (nm)</th>
            <th scope="col" className="px-3 py-1.5 text-right">FWHM (nm)</th>
            <th scope="col" className="px-3 py-1.5 text-right">Height</th>
            <th scope="col" className="px-3 py-1.5 text-right">SNR</th>
            <th scope="col" className="px-3 py-1.5">Flags</th>
          </tr>
        </thead>
        <tbody className="font-mono text-xs">
          {peaks.map((p) => (
            <tr key={p.x} className="border-b border-[var(--line)] last:border-0">
              <td className="px-3 py-1 text-right">{p.wavelengthNm.toFixed(3)}</td>
              <td className="px-3 py-1 text-right">{p.uncertaintyNm.toFixed(3)}</td>
              <td className="px-3 py-1 text-right">{p.fwhmNm.toFixed(2)}</td>
              <td className="px-3 py-1 text-right">{p.height.toFixed(0)}</td>
              <td className="px-3 py-1 text-right">{p.snr.toFixed(1)}</td>
              <td className="px-3 py-1 font-sans">{[p.saturated ? "saturated" : "", p.blended ? "blended" : ""].filter(Boolean).join(", ")}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
