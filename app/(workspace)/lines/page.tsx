// The line library: browse any release of the team's line table, filtered and sorted through the URL.
import Link from "next/link";
import { LineFilters } from "@/components/lines/line-filters";
import { LinePagination } from "@/components/lines/line-pagination";
import { LineTable } from "@/components/lines/line-table";
import { DraftEntry } from "@/components/lines/draft-entry";
import { releaseLabel } from "@/components/lines/line-values";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { can } from "@/lib/auth/policy";
import { fetchLines, fetchReleases } from "@/lib/services/line-library-reads";
import { requireWorkspace } from "@/lib/services/workspace";
import { lineSearchHref, parseLineSearch, toLineQuery } from "@/lib/validation/line-forms";
import { openDraftAction } from "./actions";
import { EntityTrail } from "@/components/audit/entity-trail";

export const metadata = { title: "Line library" };

export default async function LinesPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const { actor, team } = await requireWorkspace();
  if (!team)
    return <EmptyState title="You are not in a team yet">Ask a lab lead to invite you.</EmptyState>;
  const params = await searchParams;
  const search = parseLineSearch(params);
  const justPublished =
    typeof params.published === "string" && /^\d+$/.test(params.published)
      ? params.published
      : undefined;
  const lead = can(actor, "lines.edit", { teamId: team.teamId });
  const releases = await fetchReleases(actor, team.teamId);
  const published = releases.filter((r) => r.status === "published");
  const draft = releases.find((r) => r.status === "draft");
  const pickable = lead ? releases : published;
  const header = (
    <PageHeader
      title="Line library"
      description="Known lines and bands, each with its source, in published releases."
      actions={
        <>
          {published.length >= 2 ? (
            <Link
              href="/lines/compare"
              className="rounded border border-[var(--line)] px-3 py-1.5 text-sm hover:bg-ink-100 dark:hover:bg-ink-800"
            >
              Compare releases
            </Link>
          ) : null}
          {lead ? (
            <Link
              href="/lines/reference"
              className="rounded border border-[var(--line)] px-3 py-1.5 text-sm hover:bg-ink-100 dark:hover:bg-ink-800"
            >
              Check against a reference
            </Link>
          ) : null}
          {lead ? (
            <DraftEntry draft={draft} openAction={openDraftAction} teamId={team.teamId} />
          ) : null}
        </>
      }
    />
  );
  if (pickable.length === 0) {
    return (
      <>
        {header}
        <EmptyState title="No release of the line table yet">
          {lead
            ? "As lab lead you curate the table: open a draft, import lines into it, check the preview, and publish a release."
            : "A lab lead curates and publishes the team's line table; every identification names the release it used."}
        </EmptyState>
      </>
    );
  }
  const releaseId = pickable.some((r) => r.id === search.release)
    ? search.release
    : (published[0] ?? pickable[0]).id;
  const page = await fetchLines(actor, toLineQuery(team.teamId, search, releaseId));
  const source = search.source ?? "flame";
  const filtered = Object.entries(search).some(
    ([key, value]) => value !== undefined && !["release", "sort", "dir", "page"].includes(key),
  );
  return (
    <>
      {header}
      {justPublished ? (
        <p
          role="status"
          className="mb-3 rounded border border-teal-700 bg-[var(--panel)] p-2 text-sm"
        >
          <span aria-hidden>✓ </span>Release {justPublished} is published; the team has been
          e-mailed.
        </p>
      ) : null}
      <LineFilters
        path="/lines"
        search={search}
        releases={pickable}
        releaseId={releaseId}
        source={source}
      />
      <div className="mb-2 flex flex-wrap items-baseline justify-between gap-2 text-sm">
        <p>
          <span className="font-semibold" data-testid="shown-release">
            {releaseLabel(page.release)}
          </span>
          {page.release.publishedAt ? (
            <span className="muted"> · published {page.release.publishedAt.slice(0, 10)}</span>
          ) : null}
          {page.release.status === "draft" ? (
            <span className="muted"> · not yet published; chemists do not see it</span>
          ) : null}
        </p>
        <a href={`/api/releases/${page.release.id}/export`} className="underline" download>
          Download {releaseLabel(page.release).toLowerCase()} as CSV
        </a>
      </div>
      {page.lines.length === 0 ? (
        <EmptyState
          title={filtered ? "No line matches these filters" : "This release has no lines"}
        >
          {filtered ? (
            <>
              Widen the wavelength range or clear a filter.{" "}
              <Link href={lineSearchHref("/lines", { release: releaseId })} className="underline">
                Show every line of this release
              </Link>
              .
            </>
          ) : (
            "A lab lead adds lines in the draft."
          )}
        </EmptyState>
      ) : (
        <>
          <LineTable
            lines={page.lines}
            search={{ ...search, release: releaseId }}
            path="/lines"
            source={source}
            caption={`Lines of ${releaseLabel(page.release)}`}
            lineHref={(line) => `/lines/${encodeURIComponent(line.lineKey)}?line=${line.id}`}
          />
          <LinePagination
            path="/lines"
            search={{ ...search, release: releaseId }}
            page={page.page}
            pageSize={page.pageSize}
            total={page.total}
          />
        </>
      )}
      <EntityTrail entity="line_release" entityId={page.release.id} />
    </>
  );
}
