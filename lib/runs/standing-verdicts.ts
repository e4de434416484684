// The verdict that stands for each call of a run: the chemist's newest override of it, else what the
// analysis computed. A withdrawn override (verdict null) gives the computed verdict back. The run's
// record, the notebook's list, the review queue and the signed content all read it from here.
import type { Verdict } from "@/lib/spectrum/matching";

/** What the rule reads of a call: its species and the verdict the analysis computed. */
export interface ComputedCall<V extends string = Verdict> {
  species: string;
  verdict: V;
}

/** What the rule reads of an override: the verdict chosen (null: withdrawn) and the one computed. */
export interface VerdictOverride<V extends string = Verdict> {
  species: string;
  computedVerdict: V;
  verdict: V | null;
}

/**
 * The verdict that stands per species: the newest override, else the computed verdict. `overrides`
 * is the run's history oldest first.
 */
export function standingVerdicts<V extends string = Verdict>(
  calls: readonly ComputedCall<V>[],
  overrides: readonly VerdictOverride<V>[],
): Record<string, V> {
  const verdicts: Record<string, V> = {};
  for (const call of calls) verdicts[call.species] = call.verdict;
  for (const o of overrides) {
    const computed = calls.find((c) => c.species === o.species)?.verdict ?? o.computedVerdict;
    verdicts[o.species] = o.verdict ?? computed;
  }
  return verdicts;
}

/** The species whose standing verdict is "present", in the order the verdicts list them. */
export function presentSpecies(verdicts: Record<string, string>): string[] {
  return Object.entries(verdicts)
    .filter(([, verdict]) => verdict === "present")
    .map(([species]) => species);
}

/**
 * The override that stands for one species: the newest of an oldest-first history, unless that one
 * withdrew the override before it; null when none stands.
 */
export function standingOverride<O extends VerdictOverride<string>>(
  overrides: readonly O[],
  species: string,
): O | null {
  const newest = overrides.findLast((o) => o.species === species);
  return newest && newest.verdict !== null ? newest : null;
}

/**
 * Override histories grouped by run, each kept in the order given: the caller lists them oldest
 * first (by time, then id, as the database orders them), the order standingVerdicts reads.
 */
export function overridesByRunOf<O>(
  rows: readonly { runId: string; override: O }[],
): Map<string, O[]> {
  const byRun = new Map<string, O[]>();
  for (const { runId, override } of rows) {
    const list = byRun.get(runId) ?? [];
    list.push(override);
    byRun.set(runId, list);
  }
  return byRun;
}
