// The line library: the team's curated, versioned table of known lines and bands.
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { requireWorkspace } from "@/lib/services/workspace";

export const metadata = { title: "Line library" };

export default async function LinesPage() {
  const { team } = await requireWorkspace();
  return (
    <>
      <PageHeader title="Line library" description="Known lines and bands, each with its source, in published releases." />
      <EmptyState title="No release of the line table yet">
        {team?.role === "lab_lead"
          ? "As lab lead you curate the table: import lines into a draft, check the preview, and publish a release."
          : "A lab lead curates and publishes the team's line table; every identification names the release it used."}
      </EmptyState>
    </>
  );
}
