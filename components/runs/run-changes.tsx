// What a re-run changed against the run it repeats: calls whose standing verdict or score moved,
// species new or gone with the newer release, and peaks newly explained or unexplained.
import Link from "next/link";
import type { RunChanges } from "@/lib/runs/run-changes";
import { VerdictBadge } from "./run-evidence";
import { TableScroll } from "@/components/ui/table-scroll";

export function RunChangesPanel({ changes }: { changes: RunChanges }) {
  const nothing =
    changes.changedCalls.length +
      changes.newSpecies.length +
      changes.goneSpecies.length +
      changes.newlyExplainedNm.length +
      changes.newlyUnexplainedNm.length ===
    0;
  const nm = (values: number[]) => values.map((v) => `${v.toFixed(3)} nm`).join(", ");
  return (
    <section
      aria-labelledby="run-changes"
      className="panel flex flex-col gap-2 p-3 text-sm"
      data-testid="run-changes"
    >
      <h2 id="run-changes" className="font-semibold">
        Changed since the{" "}
        <Link href={`/runs/${changes.earlierRunId}`} className="underline">
          earlier run
        </Link>{" "}
        (release {changes.earlierReleaseNumber ?? "?"} → {changes.releaseNumber ?? "?"})
      </h2>
      {nothing ? (
        <p className="muted">Nothing: the same calls, scores and unexplained peaks.</p>
      ) : null}
      {changes.changedCalls.length > 0 ? (
        <TableScroll label="Calls that changed">
          <table className="text-sm">
            <caption className="text-left text-xs font-semibold">Calls that changed</caption>
            <thead className="text-left text-xs">
              <tr>
                <th scope="col" className="pr-3">
                  Species
                </th>
                <th scope="col" className="pr-3">
                  Before
                </th>
                <th scope="col">Now</th>
              </tr>
            </thead>
            <tbody>
              {changes.changedCalls.map((c) => (
                <tr key={c.species} className="border-t border-[var(--line)]">
                  <td className="pr-3 font-semibold">{c.species}</td>
                  <td className="pr-3">
                    <VerdictBadge verdict={c.before.verdict} />{" "}
                    <span className="font-mono text-xs">{c.before.score.toFixed(2)}</span>
                  </td>
                  <td>
                    <VerdictBadge verdict={c.after.verdict} />{" "}
                    <span className="font-mono text-xs">{c.after.score.toFixed(2)}</span>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </TableScroll>
      ) : null}
      {changes.newSpecies.length > 0 ? (
        <p>
          <span className="font-semibold">New species weighed:</span>{" "}
          {changes.newSpecies.map((s) => `${s.species} (${s.verdict})`).join(", ")}
        </p>
      ) : null}
      {changes.goneSpecies.length > 0 ? (
        <p>
          <span className="font-semibold">No longer weighed:</span>{" "}
          {changes.goneSpecies.map((s) => `${s.species} (was ${s.verdict})`).join(", ")}
        </p>
      ) : null}
      {changes.newlyExplainedNm.length > 0 ? (
        <p>
          <span className="font-semibold">Newly explained peaks:</span>{" "}
          {nm(changes.newlyExplainedNm)}
        </p>
      ) : null}
      {changes.newlyUnexplainedNm.length > 0 ? (
        <p>
          <span className="font-semibold">Newly unexplained peaks:</span>{" "}
          {nm(changes.newlyUnexplainedNm)}
        </p>
      ) : null}
    </section>
  );
}
