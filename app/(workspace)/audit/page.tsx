// The team's audit trail: who changed what, when and why, filtered through the URL, each event with
// its before and after, older events a page at a time, and the filtered trail as a CSV download.
import { DownloadButton } from "@/components/ui/download-button";
import { AuditFilters } from "@/components/audit/audit-filters";
import { AuditTable } from "@/components/audit/audit-table";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { zodFieldErrors } from "@/lib/validation/field-errors";
import { fetchAuditFacets, fetchAuditPage, type AuditFilter } from "@/lib/services/audit";
import { fetchTeamMembers } from "@/lib/services/team-members";
import { requireWorkspace } from "@/lib/services/workspace";
import { auditQuerySchema, auditSearchParams } from "@/lib/validation/audit-schemas";

export const metadata = { title: "Audit trail" };

function first(value: string | string[] | undefined): string | undefined {
  return Array.isArray(value) ? value[0] : value;
}

export default async function AuditPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const { actor, team } = await requireWorkspace();
  if (!team)
    return <EmptyState title="You are not in a team yet">Ask a lab lead to invite you.</EmptyState>;
  const raw = Object.fromEntries(Object.entries(await searchParams).map(([k, v]) => [k, first(v)]));
  // A link from a record of another of the person's teams names that team; anyone else's is ignored.
  const chosen = actor.memberships.find((m) => m.teamId === raw.teamId) ?? team;
  const parsed = auditQuerySchema.safeParse({
    ...raw,
    teamId: chosen.teamId,
    cursor: undefined,
    format: undefined,
  });
  const errors = parsed.success ? {} : zodFieldErrors(parsed.error);
  const filters = parsed.success ? parsed.data : {};
  const values: AuditFilter = {
    teamId: chosen.teamId,
    ...(parsed.success
      ? filters
      : Object.fromEntries(Object.entries(raw).filter(([, v]) => typeof v === "string"))),
  };
  const [members, facets, page] = await Promise.all([
    fetchTeamMembers(actor, chosen.teamId),
    fetchAuditFacets(actor, chosen.teamId),
    parsed.success
      ? fetchAuditPage(actor, { ...filters, teamId: chosen.teamId })
      : Promise.resolve(null),
  ]);
  const query = auditSearchParams({ ...(parsed.success ? filters : {}), teamId: chosen.teamId });
  const filtered = parsed.success && [...query.keys()].some((k) => k !== "teamId");
  const csv = new URLSearchParams(query);
  csv.set("format", "csv");
  // A page size in the URL carries on to "Load more"; the CSV always holds every matching event.
  if (parsed.success && parsed.data.limit) query.set("limit", String(parsed.data.limit));
  return (
    <>
      <PageHeader
        title="Audit trail"
        description={`Every change in ${chosen.teamName}: who, what, when and why. Events cannot be edited or deleted. Times and days are in UTC.`}
        actions={
          page && page.events.length > 0 ? (
            <DownloadButton
              href={`/api/audit?${csv}`}
              label={`Download CSV${filtered ? " of these events" : ""}`}
              what="audit CSV"
              fallbackName="emberline-audit.csv"
              testId="download-audit-csv"
            />
          ) : undefined
        }
      />
      <AuditFilters
        values={values}
        members={members}
        entities={facets.entities}
        actions={facets.actions}
        errors={errors}
      />
      {!page ? (
        <p role="alert" className="panel border-red-700 p-3 text-sm">
          Some filters are not right; correct the marked fields to see events.
        </p>
      ) : page.events.length === 0 ? (
        <EmptyState
          title={filtered ? "No event matches these filters" : "Nothing in the trail yet"}
        >
          {filtered
            ? "Widen the days, choose another person or action, or clear the filters."
            : "Events appear here as soon as anyone in the team creates or changes something."}
        </EmptyState>
      ) : (
        <AuditTable key={query.toString()} initial={page} query={query.toString()} />
      )}
    </>
  );
}
