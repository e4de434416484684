"use client";
// The team's notebooks, fetched in the browser with SWR from GET /api/notebooks and filtered by the
// search box, whose text is kept in the URL (?q=) so a filtered list can be shared or reloaded.
import Link from "next/link";
import { usePathname, useRouter, useSearchParams } from "next/navigation";
import useSWR from "swr";
import type { NotebookRecord } from "@/lib/services/workflow-types";

async function fetchJson(url: string): Promise<NotebookRecord[]> {
  const response = await fetch(url, { headers: { accept: "application/json" } });
  if (!response.ok) throw new Error(`The notebooks could not be loaded (HTTP ${response.status}).`);
  return response.json();
}

export function NotebookList({ teamId, fallback }: { teamId: string; fallback: NotebookRecord[] }) {
  const router = useRouter();
  const pathname = usePathname();
  const params = useSearchParams();
  const query = params.get("q") ?? "";
  const { data, error, isValidating } = useSWR(`/api/notebooks?teamId=${teamId}`, fetchJson, { fallbackData: fallback });
  const needle = query.trim().toLowerCase();
  const shown = (data ?? []).filter((n) => n.title.toLowerCase().includes(needle));

  function search(value: string) {
    const next = new URLSearchParams(params);
    if (value) next.set("q", value);
    else next.delete("q");
    router.replace(`${pathname}${next.size ? `?${next}` : ""}`, { scroll: false });
  }

  return (
    <section aria-labelledby="notebook-list" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <h2 id="notebook-list" className="text-lg font-semibold">
          The team&apos;s notebooks
        </h2>
        <div className="flex items-center gap-2">
          <label htmlFor="notebook-search" className="text-sm">
            Search titles
          </label>
          <input
            id="notebook-search"
            type="search"
            defaultValue={query}
            onChange={(e) => search(e.target.value)}
            className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1"
          />
          <span className="muted text-xs" aria-live="polite">
            {isValidating ? "Refreshing…" : `${shown.length} shown`}
          </span>
        </div>
      </div>
      {error ? (
        <p role="alert" className="text-sm text-red-700 dark:text-red-300">
          {error.message}
        </p>
      ) : null}
      {shown.length === 0 ? (
        <p className="muted panel p-4 text-sm">
          {needle ? `No notebook title contains “${query}”.` : "No notebooks yet: open the first one below."}
        </p>
      ) : (
        <ul className="panel divide-y divide-[var(--line)]">
          {shown.map((n) => (
            <li key={n.id} className="flex items-baseline justify-between gap-3 px-3 py-2 text-sm">
              <Link href={`/notebooks/${n.id}`} className="font-medium underline">
                {n.title}
              </Link>
              <span className="muted">
                {n.runCount} {n.runCount === 1 ? "run" : "runs"} · opened {n.createdAt.slice(0, 10)}
              </span>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
