// The review queue: runs of the team waiting for the signed-in supervisor, oldest first, with how long
// each has waited, its author, instrument and the species called present; filters live in the URL.
import Link from "next/link";
import { notFound } from "next/navigation";
import { formatTime, formatWaiting } from "@/components/review/format";
import { FilterSelect } from "@/components/ui/filter-select";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { can } from "@/lib/auth/policy";
import { fetchReviewQueue } from "@/lib/services/review-queue";
import { requireWorkspace } from "@/lib/services/workspace";
import { reviewQueueQueryFrom } from "@/lib/validation/review-schemas";
import { TableScroll } from "@/components/ui/table-scroll";

export const metadata = { title: "Review" };

type Search = Record<string, string | string[] | undefined>;

export default async function ReviewPage({ searchParams }: { searchParams: Promise<Search> }) {
  const { actor, team } = await requireWorkspace();
  if (!team || !can(actor, "run.review", { teamId: team.teamId })) notFound();
  const search = await searchParams;
  const first = (name: string) => {
    const value = search[name];
    return Array.isArray(value) ? value[0] : value;
  };
  const parsed = reviewQueueQueryFrom((name) => (name === "teamId" ? team.teamId : first(name)));
  const query = parsed.success ? parsed.data : { teamId: team.teamId };
  const queue = await fetchReviewQueue(actor, query);
  const filtered = Boolean(query.author || query.instrumentId || query.species);
  return (
    <>
      <PageHeader
        title="Review"
        description={`Runs of ${team.teamName} waiting for your review, oldest first.`}
      />
      {queue.total === 0 ? (
        <EmptyState title="Nothing waits for your review">
          When a chemist submits a run to you or to any supervisor of the team, it appears here and
          you receive an e-mail. Your own runs are reviewed by another supervisor.
        </EmptyState>
      ) : (
        <>
          <form
            method="get"
            className="mb-3 flex flex-wrap items-end gap-3"
            aria-label="Filter the queue"
          >
            <FilterSelect
              id="author"
              name="author"
              label="Author"
              anyLabel="Anyone"
              defaultValue={query.author ?? ""}
              options={queue.options.authors.map((a) => ({ value: a.id, label: a.name }))}
            />
            <FilterSelect
              id="instrumentId"
              name="instrumentId"
              label="Instrument"
              anyLabel="Any"
              defaultValue={query.instrumentId ?? ""}
              options={queue.options.instruments.map((i) => ({ value: i.id, label: i.name }))}
            />
            <FilterSelect
              id="species"
              name="species"
              label="Species called present"
              anyLabel="Any"
              defaultValue={query.species ?? ""}
              options={queue.options.species.map((sp) => ({ value: sp, label: sp }))}
            />
            <button
              type="submit"
              className="rounded border border-[var(--line)] px-3 py-1.5 text-sm hover:bg-ink-100 dark:hover:bg-ink-800"
            >
              Filter
            </button>
            {filtered ? (
              <Link href="/review" className="text-sm underline">
                Clear the filters
              </Link>
            ) : null}
          </form>
          <p className="muted mb-2 text-sm" role="status">
            {filtered
              ? `${queue.items.length} of ${queue.total} waiting runs match the filters.`
              : `${queue.total} waiting.`}
          </p>
          {queue.items.length === 0 ? (
            <p className="panel p-4 text-sm">No waiting run matches these filters.</p>
          ) : (
            <TableScroll label="Runs waiting for review" className="panel">
              <table className="w-full text-sm" data-testid="review-queue">
                <thead className="text-left text-xs">
                  <tr className="border-b border-[var(--line)]">
                    <th scope="col" className="min-w-44 px-3 py-2">
                      Run
                    </th>
                    <th scope="col" className="px-3 py-2">
                      Waiting
                    </th>
                    <th scope="col" className="px-3 py-2">
                      Author
                    </th>
                    <th scope="col" className="px-3 py-2">
                      Instrument
                    </th>
                    <th scope="col" className="min-w-32 px-3 py-2">
                      Called present
                    </th>
                    <th scope="col" className="px-3 py-2">
                      Round
                    </th>
                  </tr>
                </thead>
                <tbody className="divide-y divide-[var(--line)]">
                  {queue.items.map((item) => (
                    <tr key={item.runId} data-testid="queue-row">
                      <td className="px-3 py-2">
                        <Link href={`/review/${item.runId}`} className="font-medium underline">
                          {item.label}
                        </Link>
                        <span className="muted block text-xs">
                          {item.notebookTitle}
                          {item.versionNumber > 1 ? ` · version ${item.versionNumber}` : ""}
                          {item.namedToMe ? " · asked of you" : ""}
                        </span>
                      </td>
                      <td className="px-3 py-2">
                        {formatWaiting(item.waitingSeconds)}
                        <span className="muted block text-xs">
                          since {formatTime(item.submittedAt)}
                        </span>
                      </td>
                      <td className="px-3 py-2">{item.author?.name ?? "—"}</td>
                      <td className="px-3 py-2">{item.instrument.name}</td>
                      <td className="px-3 py-2">
                        {item.present.length ? (
                          item.present.join(", ")
                        ) : (
                          <span className="muted">none</span>
                        )}
                      </td>
                      <td className="px-3 py-2 font-mono">{item.round}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </TableScroll>
          )}
        </>
      )}
    </>
  );
}
