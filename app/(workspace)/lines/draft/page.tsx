// The draft of the line table, for lab leads only: change rows (each with a reason), add a line,
// import a CSV through a preview, and publish the draft as the next release.
import Link from "next/link";
import { notFound } from "next/navigation";
import { ImportPanel } from "@/components/lines/import-panel";
import { LineChangeForm } from "@/components/lines/line-change-form";
import { LineFilters } from "@/components/lines/line-filters";
import { LineForm } from "@/components/lines/line-form";
import { LinePagination } from "@/components/lines/line-pagination";
import { LineTable } from "@/components/lines/line-table";
import { PublishForm } from "@/components/lines/publish-form";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { NoDraftOpen } from "../no-draft-open";
import { can } from "@/lib/auth/policy";
import { fetchLine, fetchLines, fetchReleases } from "@/lib/services/line-library-reads";
import { requireWorkspace } from "@/lib/services/workspace";
import { lineSearchHref, parseLineSearch, toLineQuery } from "@/lib/validation/line-forms";
import {
  addLineAction,
  changeLineAction,
  correctLineAction,
  importAction,
  publishAction,
} from "../actions";

export const metadata = { title: "Draft of the line table" };

export default async function DraftPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const { actor, team } = await requireWorkspace();
  if (!team || !can(actor, "lines.edit", { teamId: team.teamId })) notFound();
  const params = await searchParams;
  const search = { ...parseLineSearch(params), release: undefined };
  const releases = await fetchReleases(actor, team.teamId);
  const draft = releases.find((r) => r.status === "draft");
  const published = releases.filter((r) => r.status === "published");
  if (!draft) {
    return (
      <NoDraftOpen title="Draft of the line table" teamId={team.teamId}>
        A draft starts as a copy of the newest release; publish it when your changes are done.
      </NoDraftOpen>
    );
  }
  const correctId = typeof params.correct === "string" ? params.correct : undefined;
  const [page, correcting] = await Promise.all([
    fetchLines(actor, toLineQuery(team.teamId, search, draft.id)),
    correctId ? fetchLine(actor, correctId).catch(() => null) : Promise.resolve(null),
  ]);
  const basedOn = published.find((r) => r.id === draft.basedOnReleaseId);
  const nextNumber = Math.max(0, ...published.map((r) => r.number ?? 0)) + 1;
  const source = search.source ?? "flame";
  return (
    <>
      <PageHeader
        title="Draft of the line table"
        description={`${draft.lineCount.toLocaleString("en")} lines${basedOn ? `, started from release ${basedOn.number}` : ""}${
          draft.createdByName ? ` by ${draft.createdByName}` : ""
        }. Chemists see it only once it is published.`}
        actions={
          <>
            {basedOn ? (
              <Link
                href={`/lines/compare?from=${basedOn.id}&to=${draft.id}`}
                className="rounded border border-[var(--line)] px-3 py-1.5 text-sm hover:bg-ink-100 dark:hover:bg-ink-800"
              >
                Changes since release {basedOn.number}
              </Link>
            ) : null}
            <Link
              href="/lines/reference"
              className="rounded border border-[var(--line)] px-3 py-1.5 text-sm hover:bg-ink-100 dark:hover:bg-ink-800"
            >
              Check against a reference
            </Link>
            <a
              href={`/api/releases/${draft.id}/export`}
              className="rounded border border-[var(--line)] px-3 py-1.5 text-sm hover:bg-ink-100 dark:hover:bg-ink-800"
              download
            >
              Download the draft as CSV
            </a>
          </>
        }
      />
      <div className="grid grid-cols-1 gap-5 xl:grid-cols-[3fr_2fr]">
        <section className="panel p-4" aria-labelledby="import-heading">
          <h2 id="import-heading" className="mb-1 font-semibold">
            Import a CSV
          </h2>
          <p className="muted mb-3 text-sm">
            Rows matching a draft line by species and wavelength change it; other rows are added.
            You see the preview first.
          </p>
          <ImportPanel releaseId={draft.id} action={importAction} />
        </section>
        <section className="panel p-4" aria-labelledby="publish-heading">
          <h2 id="publish-heading" className="mb-3 font-semibold">
            Publish the draft
          </h2>
          <PublishForm releaseId={draft.id} nextNumber={nextNumber} action={publishAction} />
        </section>
      </div>

      {correcting ? (
        <section className="panel mt-5 p-4" aria-labelledby="correct-heading" id="correct">
          <div className="mb-3 flex items-baseline justify-between">
            <h2 id="correct-heading" className="font-semibold">
              Correct {correcting.species} {correcting.airNm ?? correcting.vacuumNm} nm
            </h2>
            <Link href={lineSearchHref("/lines/draft", search)} className="text-sm underline">
              Close
            </Link>
          </div>
          <LineForm
            releaseId={draft.id}
            line={correcting}
            action={correctLineAction}
            submitLabel="Save the correction"
          />
        </section>
      ) : null}

      <h2 className="mt-6 mb-2 font-semibold">Lines in the draft</h2>
      <LineFilters path="/lines/draft" search={search} source={source} />
      {page.lines.length === 0 ? (
        <EmptyState title="No draft line matches these filters">
          <Link href="/lines/draft" className="underline">
            Show every line of the draft
          </Link>
          .
        </EmptyState>
      ) : (
        <>
          <LineTable
            lines={page.lines}
            search={search}
            path="/lines/draft"
            source={source}
            caption="Lines of the draft"
            lineHref={(line) => `/lines/${encodeURIComponent(line.lineKey)}?line=${line.id}`}
            rowActions={(line) => (
              <LineChangeForm
                line={line}
                correctHref={`${lineSearchHref("/lines/draft", search, { correct: line.id })}#correct`}
                action={changeLineAction}
              />
            )}
          />
          <LinePagination
            path="/lines/draft"
            search={search}
            page={page.page}
            pageSize={page.pageSize}
            total={page.total}
          />
        </>
      )}

      <details className="panel mt-5 p-4">
        <summary className="cursor-pointer font-semibold">Add a line</summary>
        <div className="mt-3">
          <LineForm releaseId={draft.id} action={addLineAction} submitLabel="Add to the draft" />
        </div>
      </details>
    </>
  );
}
