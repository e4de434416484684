// The home page's "Waiting for you": each heading the person's role has, with a count, the oldest
// items first and their ages, and a link to where the work is done; nothing waiting says so.
import Link from "next/link";
import { formatWaiting } from "@/components/review/format";
import type { WaitingForYou, WaitingRun } from "@/lib/services/waiting";
import { OLD_CALIBRATION_DAYS } from "@/lib/services/waiting-rules";

function RunList({ runs, verb }: { runs: WaitingRun[]; verb: string }) {
  return (
    <ul className="divide-line text-sm">
      {runs.map((run) => (
        <li key={run.runId} className="flex flex-wrap items-baseline justify-between gap-x-3 py-1">
          <Link href={`/runs/${run.runId}`} className="text-ember-600 underline">
            {run.label}
          </Link>
          <span className="muted text-xs">
            {run.notebookTitle}
            {run.authorName ? ` · ${run.authorName}` : ""} · {verb}{" "}
            {formatWaiting(run.waitingSeconds)} ago
          </span>
        </li>
      ))}
    </ul>
  );
}

function Heading({ id, title, count }: { id: string; title: string; count?: number }) {
  return (
    <h3 id={id} className="mt-3 mb-1 text-sm font-semibold first:mt-0">
      {title}
      {count === undefined ? null : <span className="muted font-normal"> ({count})</span>}
    </h3>
  );
}

export function WaitingPanel({ waiting }: { waiting: WaitingForYou }) {
  const { returned, drafts, review, lineTable } = waiting;
  const sections: React.ReactNode[] = [];
  if (review && review.count > 0)
    sections.push(
      <section key="review" aria-labelledby="waiting-review">
        <Heading id="waiting-review" title="Runs waiting for your review" count={review.count} />
        <RunList runs={review.runs} verb="submitted" />
        {review.count > review.runs.length ? (
          <Link href="/review" className="text-ember-600 text-xs underline">
            All {review.count} in the review queue
          </Link>
        ) : null}
      </section>,
    );
  if (returned.count > 0)
    sections.push(
      <section key="returned" aria-labelledby="waiting-returned">
        <Heading
          id="waiting-returned"
          title="Your runs returned for revision"
          count={returned.count}
        />
        <RunList runs={returned.runs} verb="returned" />
      </section>,
    );
  if (drafts.count > 0)
    sections.push(
      <section key="drafts" aria-labelledby="waiting-drafts">
        <Heading id="waiting-drafts" title="Your drafts not yet submitted" count={drafts.count} />
        <RunList runs={drafts.runs} verb="started" />
      </section>,
    );
  if (lineTable) {
    const { draft, published, oldCalibrations } = lineTable;
    if (draft)
      sections.push(
        <section key="draft-release" aria-labelledby="waiting-line-draft">
          <Heading id="waiting-line-draft" title="Draft line table" />
          <p className="text-sm">
            A draft with {draft.lineCount.toLocaleString("en")} line
            {draft.lineCount === 1 ? "" : "s"} is open since {draft.openedAt.slice(0, 10)}.{" "}
            <Link href={`/lines?release=${draft.releaseId}`} className="text-ember-600 underline">
              Review and publish it
            </Link>
          </p>
        </section>,
      );
    if (published && published.unverifiedCount > 0)
      sections.push(
        <section key="unverified" aria-labelledby="waiting-unverified">
          <Heading
            id="waiting-unverified"
            title="Unverified lines in the published table"
            count={published.unverifiedCount}
          />
          <p className="text-sm">
            Release {published.number} holds {published.unverifiedCount.toLocaleString("en")} line
            {published.unverifiedCount === 1 ? "" : "s"} not yet checked against a reference.{" "}
            <Link
              href={`/lines?release=${published.releaseId}&verified=false`}
              className="text-ember-600 underline"
            >
              See them
            </Link>
          </p>
        </section>,
      );
    if (oldCalibrations.count > 0)
      sections.push(
        <section key="calibrations" aria-labelledby="waiting-calibrations">
          <Heading
            id="waiting-calibrations"
            title={`Instruments not calibrated in the last ${OLD_CALIBRATION_DAYS} days`}
            count={oldCalibrations.count}
          />
          <ul className="divide-line text-sm">
            {oldCalibrations.instruments.map((i) => (
              <li key={i.instrumentId} className="flex justify-between gap-3 py-1">
                <Link href={`/instruments/${i.instrumentId}`} className="text-ember-600 underline">
                  {i.instrumentName}
                </Link>
                <span className="muted text-xs">
                  {i.lastCalibratedOn
                    ? `last calibrated ${i.lastCalibratedOn} (${i.ageDays} days ago)`
                    : "never calibrated"}
                </span>
              </li>
            ))}
          </ul>
        </section>,
      );
  }
  return (
    <section className="panel p-4" aria-labelledby="waiting-heading" data-testid="waiting">
      <h2 id="waiting-heading" className="mb-2 font-semibold">
        Waiting for you
      </h2>
      {sections.length ? (
        <div className="space-y-2">{sections}</div>
      ) : (
        <p className="muted text-sm">Nothing is waiting for you in this team.</p>
      )}
    </section>
  );
}
