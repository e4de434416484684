// What a re-run changed, as the runs service reports it to pages and the API. The run's own record
// and its parts live in lib/runs/types.ts, beside their rules, where lib/reports reads them too.
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
