"use client";
// The team's notebooks, fetched in the browser with SWR from GET /api/notebooks?teamId=&q= (the API
// searches the titles). The search text is kept in the URL (?q=) so a filtered list can be shared or
// reloaded; the server's first answer is SWR's fallback, so the first paint has data.
import Link from "next/link";
import { useEffect, useState } from "react";
import useSWR, { SWRConfig } from "swr";
import { fetchJson } from "@/components/notebooks/fetch-json";
import { notebooksKey } from "@/components/notebooks/list-keys";
import { RUN_STATUS_LABELS } from "@/components/notebooks/run-status";
import { useUrlFilters } from "@/components/notebooks/url-filters";
import type { NotebookRecord } from "@/lib/services/notebook-types";
import type { RunStatus } from "@/lib/runs/types";

const FILTER_KEYS = ["q"] as const;

export function NotebookList({
  teamId,
  fallback,
}: {
  teamId: string;
  fallback: Record<string, NotebookRecord[]>;
}) {
  return (
    <SWRConfig value={{ fallback }}>
      <NotebookTable teamId={teamId} />
    </SWRConfig>
  );
}

function statusLine(n: NotebookRecord): string {
  const parts = (Object.keys(RUN_STATUS_LABELS) as RunStatus[])
    .filter((s) => n.statusCounts[s] > 0)
    .map((s) => `${n.statusCounts[s]} ${RUN_STATUS_LABELS[s].toLowerCase()}`);
  return parts.join(", ");
}

function NotebookTable({ teamId }: { teamId: string }) {
  const [filters, setFilters] = useUrlFilters(FILTER_KEYS);
  const [text, setText] = useState(filters.q);
  useEffect(() => {
    if (text === filters.q) return;
    const timer = setTimeout(() => setFilters({ q: text }), 300);
    return () => clearTimeout(timer);
  }, [text, filters.q, setFilters]);
  const { data, error, isLoading } = useSWR<NotebookRecord[]>(
    notebooksKey(teamId, filters.q),
    fetchJson,
    {
      keepPreviousData: true,
    },
  );

  return (
    <section aria-labelledby="notebook-list" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <h2 id="notebook-list" className="text-lg font-semibold">
          The team&apos;s notebooks
        </h2>
        <form
          role="search"
          aria-label="Search the notebooks"
          className="flex items-center gap-2"
          onSubmit={(e) => e.preventDefault()}
        >
          <label htmlFor="notebook-search" className="text-sm">
            Search titles
          </label>
          <input
            id="notebook-search"
            type="search"
            value={text}
            maxLength={200}
            onChange={(e) => setText(e.target.value)}
            className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1"
          />
          <span className="muted text-xs" aria-live="polite" data-testid="notebooks-count">
            {isLoading ? "Loading…" : `${data?.length ?? 0} shown`}
          </span>
        </form>
      </div>
      {error ? (
        <p role="alert" className="text-sm text-red-700 dark:text-red-300">
          {error.message}
        </p>
      ) : null}
      {!data ? (
        <ul className="panel divide-y divide-[var(--line)]" aria-busy="true" data-testid="skeleton">
          {[0, 1, 2].map((i) => (
            <li key={i} className="px-3 py-2">
              <span className="block h-4 w-64 animate-pulse rounded bg-ink-100 dark:bg-ink-800" />
              {i === 0 ? <span className="sr-only">Loading the notebooks…</span> : null}
            </li>
          ))}
        </ul>
      ) : data.length === 0 ? (
        <p className="muted panel p-4 text-sm" data-testid="notebooks-empty">
          {filters.q
            ? `No notebook title contains “${filters.q}”.`
            : "No notebooks yet: open the first one below."}
        </p>
      ) : (
        <ul className="panel divide-y divide-[var(--line)]">
          {data.map((n) => (
            <li
              key={n.id}
              className="flex flex-wrap items-baseline justify-between gap-3 px-3 py-2 text-sm"
            >
              <Link href={`/notebooks/${n.id}`} className="font-medium underline">
                {n.title}
              </Link>
              <span className="muted">
                {n.runCount} {n.runCount === 1 ? "run" : "runs"}
                {n.runCount ? ` (${statusLine(n)})` : ""} · last activity{" "}
                {n.lastActivityAt.slice(0, 10)} · opened {n.createdAt.slice(0, 10)}
              </span>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
