// Notebooks: the team's identification runs, grouped by notebook.
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { requireWorkspace } from "@/lib/services/workspace";

export const metadata = { title: "Notebooks" };

export default async function NotebooksPage() {
  const { team } = await requireWorkspace();
  return (
    <>
      <PageHeader title="Notebooks" description={`Identification runs of ${team?.teamName ?? "your team"}.`} />
      <EmptyState title="No notebooks yet">
        A notebook holds runs: one sample spectrum each, with its calibration, the lines found and the element calls.
        Set up an instrument and calibrate it against a lamp first; then open a notebook for your samples.
      </EmptyState>
    </>
  );
}
