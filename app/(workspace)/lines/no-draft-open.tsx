// What a line-table page for the draft shows when no draft is open: why a draft is needed, and a
// button that opens one (a copy of the newest release).
import type { ReactNode } from "react";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { openDraftAction } from "./actions";

export function NoDraftOpen({
  title,
  teamId,
  children,
}: {
  title: string;
  teamId: string;
  /** Why this page needs a draft, in a sentence or two. */
  children: ReactNode;
}) {
  return (
    <>
      <PageHeader title={title} />
      <EmptyState title="There is no draft open">
        <p className="mb-3">{children}</p>
        <form action={openDraftAction}>
          <input type="hidden" name="teamId" value={teamId} />
          <button
            type="submit"
            className="rounded bg-ember-600 px-3 py-1.5 text-sm font-medium text-white hover:bg-ember-700"
          >
            Open the draft
          </button>
        </form>
      </EmptyState>
    </>
  );
}
