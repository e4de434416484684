// One record's audit trail (a run, a calibration, a line-table release…) for the foot of its page:
// a compact list, newest first, each event opening to its before and after, and a link to the full
// trail filtered on the record.
import { actionLabel } from "@/lib/audit/action-words";
import Link from "next/link";
import { fetchEntityTrail } from "@/lib/services/audit";
import { requireWorkspace } from "@/lib/services/workspace";
import { auditSearchParams } from "@/lib/validation/audit-schemas";
import { BeforeAfter } from "./before-after";
import { entityLabel, utcTime } from "./audit-labels";

export async function EntityTrail({ entity, entityId }: { entity: string; entityId: string }) {
  const { actor } = await requireWorkspace();
  const trail = await fetchEntityTrail(actor, entity, entityId);
  const label = entityLabel(entity).toLowerCase();
  const fullHref = `/audit?${auditSearchParams({ teamId: trail.teamId ?? undefined, entity, entityId })}`;
  return (
    <section className="mt-8" aria-labelledby="entity-trail-heading" data-testid="entity-trail">
      <div className="mb-2 flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="entity-trail-heading" className="text-lg font-semibold">
          Audit trail of this {label}
        </h2>
        <Link href={fullHref} className="text-sm underline">
          Open in the full audit trail
        </Link>
      </div>
      {trail.events.length === 0 ? (
        <p className="muted text-sm">No events recorded for this {label}.</p>
      ) : (
        <ol className="panel divide-line text-sm">
          {trail.events.map((event) => (
            <li key={event.id}>
              <details className="group">
                <summary className="flex cursor-pointer flex-wrap items-baseline gap-x-3 gap-y-0.5 px-3 py-1.5 hover:bg-ink-100 dark:hover:bg-ink-800">
                  <span className="tabular font-mono text-xs">{utcTime(event.at)}</span>
                  <span>
                    {actionLabel(event.action)}{" "}
                    <span className="muted font-mono text-xs">{event.action}</span>
                  </span>
                  <span>{event.actorName ?? "the system"}</span>
                  {event.reason ? <span className="muted">“{event.reason}”</span> : null}
                  {event.changes.length > 0 ? (
                    <span className="muted text-xs">
                      <span aria-hidden>Δ </span>
                      {event.changes.length} field{event.changes.length === 1 ? "" : "s"} changed
                    </span>
                  ) : null}
                </summary>
                <div className="border-t border-[var(--line)] px-3 py-2">
                  <BeforeAfter
                    before={event.before}
                    after={event.after}
                    changes={event.changes}
                    caption={`Before and after of ${event.action} at ${utcTime(event.at)}`}
                  />
                </div>
              </details>
            </li>
          ))}
        </ol>
      )}
      {trail.more ? (
        <p className="muted mt-1 text-xs">
          Showing the newest {trail.events.length}; the full audit trail has the older ones.
        </p>
      ) : null}
    </section>
  );
}
