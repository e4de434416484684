// The run page's review panel: where the run stands (status, round, version), why it is locked, the
// submit form with an optional reviewer, the rounds' comments, the signature, and Amend for a signed run.
import Link from "next/link";
import { amendRunAction, submitRunAction } from "@/app/(workspace)/review/actions";
import { fetchRunReviewState } from "@/lib/services/run-review-history";
import { requireWorkspace } from "@/lib/services/workspace";
import { ReviewHistory } from "./review-history";
import { AmendForm, SubmitForm } from "./review-forms";

export async function RunReviewPanel({ runId }: { runId: string }) {
  const { actor } = await requireWorkspace();
  const state = await fetchRunReviewState(actor, runId);
  const { history } = state;
  return (
    <section
      aria-labelledby="review-panel-title"
      className="panel mb-4 flex flex-col gap-3 p-4"
      data-testid="run-review-panel"
    >
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="review-panel-title" className="text-lg font-semibold">
          Review
        </h2>
        <p className="text-sm">
          <span
            className="rounded border border-[var(--line)] px-1.5 py-0.5 text-xs font-semibold"
            data-testid="run-status"
          >
            {state.statusLabel}
          </span>
          <span className="muted">
            {" "}
            · version {history.versionNumber}
            {history.reviewRound > 0 ? ` · round ${history.reviewRound}` : ""}
          </span>
        </p>
      </div>
      {history.amendsRunId ? (
        <p className="text-sm">
          This version amends{" "}
          <Link href={`/runs/${history.amendsRunId}`} className="underline">
            the signed version {history.versionNumber - 1}
          </Link>
          .
        </p>
      ) : null}
      {state.lockReason ? (
        <p
          className="rounded border border-ember-600 p-2 text-sm"
          role="note"
          data-testid="lock-note"
        >
          <span className="font-semibold">Locked: </span>
          {state.lockReason}
        </p>
      ) : null}
      {state.status === "returned" && state.isAuthor ? (
        <p className="text-sm">
          The reviewer returned this run: see their comments below, revise it and submit it again.
        </p>
      ) : null}
      {state.maySubmit ? (
        <SubmitForm
          runId={state.runId}
          reviewers={state.reviewers}
          returned={state.status === "returned"}
          action={submitRunAction}
        />
      ) : null}
      {state.status === "submitted" && state.isReviewer ? (
        <p className="text-sm">
          {state.mayDecide ? (
            <Link href={`/review/${state.runId}`} className="font-medium underline">
              Open the review of this run
            </Link>
          ) : (
            <span data-testid="why-not-review">{state.whyNotDecide}</span>
          )}
        </p>
      ) : null}
      <ReviewHistory history={history} />
      {history.amendedById ? (
        <p className="text-sm">
          This signed version has been amended:{" "}
          <Link href={`/runs/${history.amendedById}`} className="underline">
            open the newer version
          </Link>
          .
        </p>
      ) : null}
      {state.mayAmend ? (
        <AmendForm
          runId={state.runId}
          nextVersion={history.versionNumber + 1}
          action={amendRunAction}
        />
      ) : null}
    </section>
  );
}
