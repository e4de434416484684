// Checking the draft of the line table against a reference file, for lab leads only: which rows agree
// within the combined uncertainty, which disagree (each decided), then one confirmed, audited step.
import Link from "next/link";
import { notFound } from "next/navigation";
import { ReferenceCheckPanel } from "@/components/lines/reference-check-panel";
import { PageHeader } from "@/components/ui/page-header";
import { NoDraftOpen } from "../no-draft-open";
import { can } from "@/lib/auth/policy";
import { fetchReleases } from "@/lib/services/line-library-reads";
import { requireWorkspace } from "@/lib/services/workspace";
import { referenceCheckAction } from "../actions";

export const metadata = { title: "Check the draft against a reference" };

export default async function ReferenceCheckPage() {
  const { actor, team } = await requireWorkspace();
  if (!team || !can(actor, "lines.edit", { teamId: team.teamId })) notFound();
  const releases = await fetchReleases(actor, team.teamId);
  const draft = releases.find((r) => r.status === "draft");
  const title = "Check the draft against a reference";
  if (!draft) {
    return (
      <NoDraftOpen title={title} teamId={team.teamId}>
        Published releases never change, so a check marks rows verified in the draft; they are
        verified for chemists once you publish it.
      </NoDraftOpen>
    );
  }
  return (
    <>
      <PageHeader
        title={title}
        description="Compare the draft's wavelengths with lines exported from an authoritative line database. Rows that agree within their combined uncertainty are marked verified with the reference's citation in one step; disagreements wait for your decision. Published releases never change: the verification reaches chemists with the next release."
        actions={
          <Link
            href="/lines/draft"
            className="rounded border border-[var(--line)] px-3 py-1.5 text-sm hover:bg-ink-100 dark:hover:bg-ink-800"
          >
            Back to the draft
          </Link>
        }
      />
      <section className="panel p-4" aria-labelledby="reference-heading">
        <h2 id="reference-heading" className="mb-3 font-semibold">
          Reference file
        </h2>
        <ReferenceCheckPanel releaseId={draft.id} action={referenceCheckAction} />
      </section>
    </>
  );
}
