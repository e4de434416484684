// What the review page says in place of the Decide forms once a run is no longer waiting for review:
// what was decided, by whom and when, and what happens next — never only "you cannot decide".
import type { RunHistory } from "@/lib/services/run-review-types";
import { formatTime } from "./format";

export interface DecisionOutcome {
  /** A short heading: "Returned for revision", "Signed", "Not submitted". */
  title: string;
  /** One or two sentences. */
  text: string;
}

/**
 * The latest decision on the run in words, for the person `viewerId` (who reads "You" for their own
 * decision); null while the current round waits for a decision.
 */
export function decisionOutcome(history: RunHistory, viewerId: string): DecisionOutcome | null {
  const current = history.rounds.find((r) => r.round === history.reviewRound);
  if (history.status === "submitted" && current && current.decision === null) return null;
  if (!current || current.decision === null) {
    return {
      title: "Not submitted",
      text: "This run is not submitted for review yet: its author submits it from the run page.",
    };
  }
  const who =
    current.decidedBy?.id === viewerId ? "You" : (current.decidedBy?.name ?? "A supervisor");
  const when = formatTime(current.decidedAt ?? current.submittedAt);
  if (current.decision === "returned") {
    return {
      title: "Returned for revision",
      text:
        history.status === "returned"
          ? `${who} returned this run to its author on ${when} (round ${current.round}). It comes back to the review queue when the author submits it again.`
          : `${who} returned round ${current.round} on ${when}.`,
    };
  }
  return {
    title: "Signed",
    text: `${who} signed this run on ${when} (round ${current.round}), meaning “${history.signature?.meaning ?? "Reviewed and approved"}”. A signed run is never changed: an amendment starts a new version, which is reviewed again.`,
  };
}
