// The review queue: runs waiting for a supervisor's sign-off.
import { notFound } from "next/navigation";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { can } from "@/lib/auth/policy";
import { requireWorkspace } from "@/lib/services/workspace";

export const metadata = { title: "Review" };

export default async function ReviewPage() {
  const { actor, team } = await requireWorkspace();
  if (!team || !can(actor, "run.review", { teamId: team.teamId })) notFound();
  return (
    <>
      <PageHeader title="Review" description="Runs your team has submitted for sign-off, oldest first." />
      <EmptyState title="Nothing waits for your review">
        When a chemist submits a run, it appears here and you receive an e-mail.
      </EmptyState>
    </>
  );
}
