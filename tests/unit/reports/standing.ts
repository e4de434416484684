// The standing-verdict rule of lib/services/runs.ts (newest override wins, a withdrawn one falls back
// to the computed verdict), restated for fixtures: the service module itself is server-only.
import type { Verdict } from "@/lib/spectrum/matching";
import type { RunRecord } from "@/lib/services/run-types";

export function standingVerdictsForTest(run: RunRecord): Record<string, Verdict> {
  const verdicts: Record<string, Verdict> = {};
  for (const c of run.calls) verdicts[c.species] = c.verdict;
  for (const o of run.overrides)
    verdicts[o.species] = o.verdict ?? run.calls.find((c) => c.species === o.species)!.verdict;
  return verdicts;
}
