// A run's review so far: each round with who submitted it, to whom, the decision and its comment and the
// reviewer's marks, then the signature (meaning, signer, time, content hash) and the run's versions.
import Link from "next/link";
import type { RunHistory, SignatureRecord } from "@/lib/services/run-review-types";
import { formatTime } from "./format";

const DECISION = { returned: "Returned for revision", signed: "Signed" } as const;

export function SignatureBlock({ signature }: { signature: SignatureRecord }) {
  return (
    <div className="rounded border border-teal-700 p-3 text-sm" data-testid="signature">
      <p className="font-semibold">
        <span aria-hidden>✔ </span>Signed: &ldquo;{signature.meaning}&rdquo;
      </p>
      <dl className="mt-1 grid grid-cols-[max-content_1fr] gap-x-3 gap-y-0.5 text-xs">
        <dt className="muted">Signer</dt>
        <dd>{signature.signerName}</dd>
        <dt className="muted">Time</dt>
        <dd>{formatTime(signature.signedAt)}</dd>
        <dt className="muted">Review round</dt>
        <dd>{signature.round}</dd>
        <dt className="muted">Content SHA-256</dt>
        <dd className="break-all font-mono">{signature.contentHash}</dd>
      </dl>
    </div>
  );
}

export function ReviewHistory({ history }: { history: RunHistory }) {
  return (
    <div className="flex flex-col gap-3" data-testid="review-history">
      {history.rounds.length === 0 ? (
        <p className="muted text-sm">Not submitted for review yet.</p>
      ) : null}
      <ol className="flex flex-col gap-2">
        {history.rounds.map((round) => (
          <li
            key={round.round}
            className="rounded border border-[var(--line)] p-3 text-sm"
            data-testid="review-round"
          >
            <p>
              <span className="font-semibold">Round {round.round}</span> · submitted by{" "}
              {round.submittedBy?.name ?? "someone"} on {formatTime(round.submittedAt)}
              {round.requestedReviewer
                ? ` to ${round.requestedReviewer.name}`
                : " to any supervisor"}
            </p>
            {round.reply ? (
              <blockquote
                className="mt-1 whitespace-pre-wrap border-l-2 border-teal-700 pl-2"
                data-testid="round-reply"
              >
                <span className="font-semibold">Reply to the comments: </span>
                {round.reply}
              </blockquote>
            ) : null}
            <p className="mt-1">
              {round.decision ? (
                <>
                  <span className="font-semibold">{DECISION[round.decision]}</span> by{" "}
                  {round.decidedBy?.name ?? "someone"} on {formatTime(round.decidedAt!)}
                </>
              ) : (
                <span className="muted">Waiting for the reviewer.</span>
              )}
            </p>
            {round.comment ? (
              <blockquote
                className="mt-1 whitespace-pre-wrap border-l-2 border-ember-600 pl-2"
                data-testid="round-comment"
              >
                {round.comment}
              </blockquote>
            ) : null}
            {round.marks.length > 0 ? (
              <ul
                className="mt-2 flex flex-col gap-1 text-xs"
                aria-label={`Marks of round ${round.round}`}
              >
                {round.marks.map((m) => (
                  <li key={m.id} data-testid="review-mark">
                    <span className="font-semibold">{m.species}</span>
                    {m.lineNm !== null ? (
                      <span className="font-mono"> {m.lineNm.toFixed(3)} nm</span>
                    ) : null}
                    {m.agreement ? (
                      <span className="ml-1 rounded border border-[var(--line)] px-1">
                        <span aria-hidden>{m.agreement === "agree" ? "✓ " : "✗ "}</span>
                        {m.agreement === "agree" ? "agrees" : "disagrees"}
                      </span>
                    ) : null}
                    {m.comment ? <span> — {m.comment}</span> : null}
                    <span className="muted"> ({m.reviewer?.name ?? "reviewer"})</span>
                  </li>
                ))}
              </ul>
            ) : null}
          </li>
        ))}
      </ol>
      {history.signature ? <SignatureBlock signature={history.signature} /> : null}
      {history.versions.length > 1 ? (
        <nav aria-label="Versions of this run" className="text-sm">
          <p className="font-semibold">Versions</p>
          <ul className="flex flex-wrap gap-3">
            {history.versions.map((v) => (
              <li key={v.id}>
                {v.id === history.runId ? (
                  <span aria-current="page" className="font-semibold">
                    Version {v.versionNumber} ({v.status}, this one)
                  </span>
                ) : (
                  <Link href={`/runs/${v.id}`} className="underline">
                    Version {v.versionNumber} ({v.status})
                  </Link>
                )}
              </li>
            ))}
          </ul>
        </nav>
      ) : null}
    </div>
  );
}
