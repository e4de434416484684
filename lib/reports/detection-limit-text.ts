// One wording of an absent call's detection limit for the page, the printable report, the PDF and
// the CSV, so they cannot drift apart.
import type { StoredDetectionLimit } from "@/lib/runs/types";

/** "< 52 counts (0.41 % of the strongest peak) at 422.67 nm", or "—" when there is none. */
export function detectionLimitText(limit: StoredDetectionLimit | null | undefined): string {
  if (!limit) return "—";
  const counts = limit.counts >= 100 ? limit.counts.toFixed(0) : limit.counts.toPrecision(2);
  const share =
    limit.relativeToStrongest === null
      ? ""
      : ` (${formatPercent(limit.relativeToStrongest)} of the strongest peak)`;
  const which = limit.principal ? "" : ", the strongest line in range";
  return `< ${counts} counts${share} at ${limit.lineNm.toFixed(2)} nm${which}`;
}

function formatPercent(share: number): string {
  const percent = 100 * share;
  return `${percent >= 10 ? percent.toFixed(0) : percent >= 1 ? percent.toFixed(1) : percent.toPrecision(2)} %`;
}

/** The report's sentence over the absent species that have a limit, or null when none has one. */
export function detectionLimitsSentence(
  absentLimits: readonly { species: string; limit: string }[],
): string | null {
  const limited = absentLimits.filter((a) => a.limit !== "—");
  if (limited.length === 0) return null;
  return `Detection limits (the least height each one's strongest line in range needed to be found): ${limited
    .map((a) => `${a.species} ${a.limit}`)
    .join("; ")}.`;
}
