// What a re-run changed from the run it repeats: calls whose standing verdict or score moved, species
// weighed only before or only now, and peaks that gained or lost a candidate line. Pure: the runs
// service loads both records and asks this module; the run page shows the answer.
import type { Verdict } from "@/lib/spectrum/matching";

/** What changed from an earlier run of the same sample to its re-run against a newer release. */
export interface RunChanges {
  earlierRunId: string;
  earlierReleaseNumber: number | null;
  releaseNumber: number | null;
  /** Species in both runs whose standing verdict or score changed. */
  changedCalls: {
    species: string;
    before: { verdict: Verdict; score: number };
    after: { verdict: Verdict; score: number };
  }[];
  /** Species the re-run weighs that the earlier run did not, with their verdict now. */
  newSpecies: { species: string; verdict: Verdict }[];
  /** Species the earlier run weighed that the re-run no longer does, with their verdict then. */
  goneSpecies: { species: string; verdict: Verdict }[];
  /** Peaks (nm) unexplained before that now have a candidate line. */
  newlyExplainedNm: number[];
  /** Peaks (nm) that had a candidate line before and are unexplained now. */
  newlyUnexplainedNm: number[];
}

/** Scores closer than this are the same score (they are shown to two decimals). */
const SCORE_STEP = 0.005;

/** Same peak on the same axis: the runs share the spectrum and calibration, so centres agree to rounding. */
const samePeak = (a: number, b: number) => Math.abs(a - b) < 1e-6;

/** What the comparison reads of a run: its release, its calls with their standing verdicts, and its
 * unexplained peaks. */
export interface ComparedRun {
  id: string;
  lineReleaseNumber: number | null;
  calls: { species: string; verdict: Verdict; score: number }[];
  unexplained: { wavelengthNm: number }[];
}

/** What changed from `earlier` to `run`, its re-run. */
export function runChanges(earlier: ComparedRun, run: Omit<ComparedRun, "id">): RunChanges {
  const before = new Map(earlier.calls.map((c) => [c.species, c]));
  const after = new Map(run.calls.map((c) => [c.species, c]));
  const changedCalls: RunChanges["changedCalls"] = [];
  for (const [species, now] of after) {
    const then = before.get(species);
    if (then && (then.verdict !== now.verdict || Math.abs(then.score - now.score) >= SCORE_STEP)) {
      changedCalls.push({
        species,
        before: { verdict: then.verdict, score: then.score },
        after: { verdict: now.verdict, score: now.score },
      });
    }
  }
  const unexplainedThen = earlier.unexplained.map((u) => u.wavelengthNm);
  const unexplainedNow = run.unexplained.map((u) => u.wavelengthNm);
  return {
    earlierRunId: earlier.id,
    earlierReleaseNumber: earlier.lineReleaseNumber,
    releaseNumber: run.lineReleaseNumber,
    changedCalls,
    newSpecies: run.calls
      .filter((c) => !before.has(c.species))
      .map((c) => ({ species: c.species, verdict: c.verdict })),
    goneSpecies: earlier.calls
      .filter((c) => !after.has(c.species))
      .map((c) => ({ species: c.species, verdict: c.verdict })),
    newlyExplainedNm: unexplainedThen.filter((nm) => !unexplainedNow.some((n) => samePeak(n, nm))),
    newlyUnexplainedNm: unexplainedNow.filter(
      (nm) => !unexplainedThen.some((n) => samePeak(n, nm)),
    ),
  };
}
