// Compare two releases of the team's line table: lines added, removed and changed between them.
import Link from "next/link";
import { ReleaseDiffView } from "@/components/lines/release-diff";
import { releaseLabel } from "@/components/lines/line-values";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { can } from "@/lib/auth/policy";
import { fetchReleases } from "@/lib/services/line-library-reads";
import { diffReleases } from "@/lib/services/line-library-releases";
import { requireWorkspace } from "@/lib/services/workspace";
import { compareSearchSchema } from "@/lib/validation/line-forms";

export const metadata = { title: "Compare releases" };

const selectClass = "rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1 text-sm";

export default async function ComparePage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const { actor, team } = await requireWorkspace();
  if (!team)
    return <EmptyState title="You are not in a team yet">Ask a lab lead to invite you.</EmptyState>;
  const lead = can(actor, "lines.edit", { teamId: team.teamId });
  const all = await fetchReleases(actor, team.teamId);
  const releases = lead ? all : all.filter((r) => r.status === "published");
  const published = all.filter((r) => r.status === "published");
  const asked = compareSearchSchema.parse(await searchParams);
  const known = (id: string | undefined) => (releases.some((r) => r.id === id) ? id : undefined);
  const fromId = known(asked.from) ?? published[1]?.id ?? published[0]?.id;
  const toId = known(asked.to) ?? published[0]?.id;
  const diff =
    fromId && toId && fromId !== toId
      ? await diffReleases(actor, { teamId: team.teamId, fromId, toId })
      : null;
  return (
    <>
      <nav aria-label="Breadcrumb" className="muted mb-2 text-sm">
        <Link href="/lines" className="underline">
          Line library
        </Link>
      </nav>
      <PageHeader
        title="Compare releases"
        description="Which lines one release adds, removes and changes against another."
      />
      {releases.length < 2 ? (
        <EmptyState title="There is only one release">
          Once a second release is published, you can compare the two here.
        </EmptyState>
      ) : (
        <>
          <form
            method="get"
            action="/lines/compare"
            className="panel mb-4 flex flex-wrap items-end gap-3 p-3"
            aria-label="Releases to compare"
          >
            <div className="flex flex-col gap-0.5">
              <label htmlFor="from" className="text-xs font-medium">
                From
              </label>
              <select id="from" name="from" defaultValue={fromId} className={selectClass}>
                {releases.map((r) => (
                  <option key={r.id} value={r.id}>
                    {releaseLabel(r)}
                  </option>
                ))}
              </select>
            </div>
            <div className="flex flex-col gap-0.5">
              <label htmlFor="to" className="text-xs font-medium">
                To
              </label>
              <select id="to" name="to" defaultValue={toId} className={selectClass}>
                {releases.map((r) => (
                  <option key={r.id} value={r.id}>
                    {releaseLabel(r)}
                  </option>
                ))}
              </select>
            </div>
            <button
              type="submit"
              className="rounded bg-ember-600 px-3 py-1 text-sm font-medium text-white hover:bg-ember-700"
            >
              Compare
            </button>
          </form>
          {diff ? (
            <ReleaseDiffView diff={diff} />
          ) : (
            <p className="muted text-sm">Choose two different releases.</p>
          )}
        </>
      )}
    </>
  );
}
