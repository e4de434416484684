"use client";
// The team's trail as a table: time, person, action, entity (linked where it has a page) and reason;
// each row opens to show its before and after; "Load more" fetches the next, older page.
import { actionLabel } from "@/lib/audit/action-words";
import Link from "next/link";
import { Fragment, useState } from "react";
import type { AuditEventRecord, AuditPage } from "@/lib/services/audit";
import { BeforeAfter } from "./before-after";
import { entityHref, entityLabel, shortId, utcTime } from "./audit-labels";
import { TableScroll } from "@/components/ui/table-scroll";

export function AuditTable({
  initial,
  query,
}: {
  initial: AuditPage;
  /** The filters' query string (without cursor), for the next pages. */
  query: string;
}) {
  const [events, setEvents] = useState<AuditEventRecord[]>(initial.events);
  const [cursor, setCursor] = useState<string | null>(initial.nextCursor);
  const [open, setOpen] = useState<ReadonlySet<string>>(new Set());
  const [loading, setLoading] = useState(false);
  const [error, setError] = useState<string | null>(null);

  function toggle(id: string) {
    setOpen((current) => {
      const next = new Set(current);
      if (next.has(id)) next.delete(id);
      else next.add(id);
      return next;
    });
  }

  async function loadMore() {
    if (!cursor) return;
    setLoading(true);
    setError(null);
    try {
      const params = new URLSearchParams(query);
      params.set("cursor", cursor);
      const response = await fetch(`/api/audit?${params}`, {
        headers: { accept: "application/json" },
      });
      const body = (await response.json()) as AuditPage | { error: { message: string } };
      if (!response.ok || "error" in body) {
        throw new Error(
          "error" in body ? body.error.message : `The server answered ${response.status}.`,
        );
      }
      setEvents((current) => [...current, ...body.events]);
      setCursor(body.nextCursor);
    } catch (caught) {
      setError(caught instanceof Error ? caught.message : "The next events could not be loaded.");
    } finally {
      setLoading(false);
    }
  }

  return (
    <div>
      <TableScroll label="Audit events" className="panel">
        <table className="w-full text-sm" data-testid="audit-table">
          <caption className="sr-only">Audit events, newest first</caption>
          <thead className="muted border-b border-[var(--line)] text-left text-xs">
            <tr>
              <th scope="col" className="px-3 py-2 font-medium">
                <span className="sr-only">Details</span>
              </th>
              <th scope="col" className="px-3 py-2 font-medium">
                Time (UTC)
              </th>
              <th scope="col" className="px-3 py-2 font-medium">
                Person
              </th>
              <th scope="col" className="min-w-40 px-3 py-2 font-medium">
                Action
              </th>
              <th scope="col" className="px-3 py-2 font-medium">
                Entity
              </th>
              <th scope="col" className="min-w-60 px-3 py-2 font-medium">
                Reason
              </th>
            </tr>
          </thead>
          <tbody>
            {events.map((event) => {
              const expanded = open.has(event.id);
              const href = entityHref(event.entity, event.entityId);
              const detailsId = `audit-details-${event.id}`;
              return (
                <Fragment key={event.id}>
                  <tr
                    className="border-b border-[var(--line)] align-top"
                    data-testid="audit-row"
                    data-action={event.action}
                  >
                    <td className="px-3 py-1.5">
                      <button
                        type="button"
                        onClick={() => toggle(event.id)}
                        aria-expanded={expanded}
                        aria-controls={detailsId}
                        className="whitespace-nowrap rounded border border-[var(--line)] px-1.5 text-xs hover:bg-ink-100 dark:hover:bg-ink-800"
                      >
                        <span aria-hidden>{expanded ? "▾" : "▸"} </span>
                        {expanded ? "Hide" : "Show"}
                        <span className="sr-only">
                          {" "}
                          before and after of {event.action} at {utcTime(event.at)}
                        </span>
                      </button>
                    </td>
                    <td className="tabular whitespace-nowrap px-3 py-1.5 font-mono text-xs">
                      {utcTime(event.at)}
                    </td>
                    <td className="px-3 py-1.5">
                      {event.actorName ?? <span className="muted">the system</span>}
                      {event.actorEmail ? (
                        <div className="muted text-xs">{event.actorEmail}</div>
                      ) : null}
                    </td>
                    <td className="px-3 py-1.5">
                      {actionLabel(event.action)}
                      <div className="muted font-mono text-xs">{event.action}</div>
                    </td>
                    <td className="px-3 py-1.5">
                      {entityLabel(event.entity)}
                      {event.entityId ? (
                        <>
                          {" "}
                          {href ? (
                            <Link
                              href={href}
                              className="font-mono text-xs underline"
                              title={event.entityId}
                            >
                              {shortId(event.entityId)}
                            </Link>
                          ) : (
                            <span className="muted font-mono text-xs" title={event.entityId}>
                              {shortId(event.entityId)}
                            </span>
                          )}
                        </>
                      ) : null}
                    </td>
                    <td className="px-3 py-1.5">
                      {event.reason ?? <span className="muted">—</span>}
                    </td>
                  </tr>
                  {expanded ? (
                    <tr
                      id={detailsId}
                      className="border-b border-[var(--line)] bg-[var(--surface)]"
                    >
                      <td colSpan={6} className="px-3 py-2">
                        <BeforeAfter
                          before={event.before}
                          after={event.after}
                          changes={event.changes}
                          caption={`Before and after of ${event.action} at ${utcTime(event.at)}`}
                        />
                      </td>
                    </tr>
                  ) : null}
                </Fragment>
              );
            })}
          </tbody>
        </table>
      </TableScroll>
      <div className="mt-3 flex flex-wrap items-center gap-3 text-sm">
        <p role="status" aria-live="polite" className="muted">
          {events.length} event{events.length === 1 ? "" : "s"} shown
          {cursor ? "; older ones follow" : ", the whole trail for these filters"}.
        </p>
        {cursor ? (
          <button
            type="button"
            onClick={loadMore}
            disabled={loading}
            aria-busy={loading || undefined}
            className="rounded border border-[var(--line)] bg-[var(--panel)] px-3 py-1.5 text-sm font-medium hover:bg-ink-100 disabled:cursor-not-allowed dark:hover:bg-ink-800"
          >
            {loading ? "Loading…" : "Load more"}
          </button>
        ) : null}
        {error ? (
          <p role="alert" className="text-red-700 dark:text-red-300">
            {error}
          </p>
        ) : null}
      </div>
    </div>
  );
}
