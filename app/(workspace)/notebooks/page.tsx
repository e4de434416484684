// Notebooks: the team's notebooks (a title search kept in the URL, fetched in the browser) and a form to open one.
import { Suspense } from "react";
import { notebooksKey, oneParam } from "@/components/notebooks/list-keys";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { NotebookForm } from "@/components/notebooks/notebook-form";
import { NotebookList } from "@/components/notebooks/notebook-list";
import { fetchNotebooks } from "@/lib/services/notebooks";
import { requireWorkspace } from "@/lib/services/workspace";
import { notebookListQuerySchema } from "@/lib/validation/notebook-schemas";
import { createNotebookAction } from "./actions";

export const metadata = { title: "Notebooks" };

export default async function NotebooksPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const { actor, team } = await requireWorkspace();
  if (!team)
    return <EmptyState title="You are not in a team yet">Ask a lab lead to invite you.</EmptyState>;
  // The list under the URL's search becomes SWR's fallback, so the first paint has data.
  const q = oneParam((await searchParams).q);
  const query = notebookListQuerySchema.safeParse({ q });
  const fallback = query.success
    ? { [notebooksKey(team.teamId, q)]: await fetchNotebooks(actor, team.teamId, query.data) }
    : {};
  return (
    <>
      <PageHeader
        title="Notebooks"
        description={`Identification runs of ${team.teamName}: one sample spectrum each, with its calibration, lines and calls.`}
      />
      <div className="flex flex-col gap-6">
        <Suspense fallback={<p className="muted text-sm">Loading the notebooks…</p>}>
          <NotebookList teamId={team.teamId} fallback={fallback} />
        </Suspense>
        <NotebookForm teamId={team.teamId} action={createNotebookAction} />
      </div>
    </>
  );
}
