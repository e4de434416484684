// Notebooks: the team's notebooks (a searchable list kept fresh in the browser) and a form to open one.
import { Suspense } from "react";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { NotebookForm } from "@/components/workflow/notebook-form";
import { NotebookList } from "@/components/workflow/notebook-list";
import { fetchNotebooks } from "@/lib/services/notebooks";
import { requireWorkspace } from "@/lib/services/workspace";
import { createNotebookAction } from "./actions";

export const metadata = { title: "Notebooks" };

export default async function NotebooksPage() {
  const { actor, team } = await requireWorkspace();
  if (!team) return <EmptyState title="You are not in a team yet">Ask a lab lead to invite you.</EmptyState>;
  const notebooks = await fetchNotebooks(actor, team.teamId);
  return (
    <>
      <PageHeader
        title="Notebooks"
        description={`Identification runs of ${team.teamName}: one sample spectrum each, with its calibration, lines and calls.`}
      />
      <div className="flex flex-col gap-6">
        <Suspense fallback={<p className="muted text-sm">Loading the notebooks…</p>}>
          <NotebookList teamId={team.teamId} fallback={notebooks} />
        </Suspense>
        <NotebookForm teamId={team.teamId} action={createNotebookAction} />
      </div>
    </>
  );
}
