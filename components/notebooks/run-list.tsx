"use client";
// A notebook's runs with their filters (status, a species that stands as present, instrument, free
// text), fetched in the browser with SWR from GET /api/notebooks/:id/runs. The filters live in the URL,
// so a filtered view can be shared; the server's first answer is SWR's fallback, so the first paint has data.
import { FilterSelect } from "@/components/ui/filter-select";
import Link from "next/link";
import { useEffect, useState } from "react";
import useSWR, { SWRConfig } from "swr";
import type { RunStatus } from "@/lib/runs/types";
import type { RunSummary } from "@/lib/services/notebook-types";
import { fetchJson } from "./fetch-json";
import { RUN_STATUS_LABELS, RunStatusBadge } from "./run-status";
import { SkeletonRows } from "./skeleton-rows";
import { RUN_FILTER_KEYS, runsKey } from "./list-keys";
import { useUrlFilters } from "./url-filters";
import { TableScroll } from "@/components/ui/table-scroll";

const STATUSES = Object.keys(RUN_STATUS_LABELS) as RunStatus[];
const COLUMNS = 7;
const inputClass = "rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5 text-sm";

/** Keeps typed text local and sends it to the URL once typing pauses. */
function useDebounced(
  value: string,
  send: (value: string) => void,
  ms = 300,
): [string, (v: string) => void] {
  const [text, setText] = useState(value);
  useEffect(() => {
    if (text === value) return;
    const timer = setTimeout(() => send(text), ms);
    return () => clearTimeout(timer);
  }, [text, value, send, ms]);
  return [text, setText];
}

export function RunList(props: {
  notebookId: string;
  instruments: { id: string; name: string }[];
  /** SWR fallback: the server's answer for the filters in the URL, keyed by runsKey. */
  fallback: Record<string, RunSummary[]>;
}) {
  return (
    <SWRConfig value={{ fallback: props.fallback }}>
      <RunTable notebookId={props.notebookId} instruments={props.instruments} />
    </SWRConfig>
  );
}

function RunTable({
  notebookId,
  instruments,
}: {
  notebookId: string;
  instruments: { id: string; name: string }[];
}) {
  const [filters, setFilters] = useUrlFilters(RUN_FILTER_KEYS);
  const [species, setSpecies] = useDebounced(filters.species, (v) => setFilters({ species: v }));
  const [q, setQ] = useDebounced(filters.q, (v) => setFilters({ q: v }));
  const key = runsKey(notebookId, filters);
  // While a new filter's answer is on its way the previous rows stay (dimmed), so the table does not jump.
  const { data, error, isLoading } = useSWR<RunSummary[]>(key, fetchJson, {
    keepPreviousData: true,
  });
  const filtered = RUN_FILTER_KEYS.some((k) => filters[k]);

  function clear() {
    setSpecies("");
    setQ("");
    setFilters({ status: "", species: "", instrumentId: "", q: "" });
  }

  return (
    <section aria-labelledby="runs-heading" className="flex flex-col gap-3">
      <h2 id="runs-heading" className="text-lg font-semibold">
        Runs
      </h2>
      <form
        role="search"
        aria-label="Filter the runs"
        className="flex flex-wrap items-end gap-3"
        onSubmit={(e) => e.preventDefault()}
      >
        <FilterSelect
          id="run-status"
          label="Status"
          anyLabel="Any status"
          value={filters.status}
          onChange={(e) => setFilters({ status: e.target.value })}
          options={STATUSES.map((st) => ({ value: st, label: RUN_STATUS_LABELS[st] }))}
        />
        <div className="flex flex-col gap-1">
          <label htmlFor="run-species" className="text-sm font-medium">
            Called present
          </label>
          <input
            id="run-species"
            value={species}
            onChange={(e) => setSpecies(e.target.value)}
            placeholder="e.g. K I or Sr"
            aria-describedby="run-species-hint"
            maxLength={40}
            className={`${inputClass} w-36`}
          />
          <span id="run-species-hint" className="sr-only">
            A species such as K I, or an element symbol for all its ion stages
          </span>
        </div>
        <FilterSelect
          id="run-instrument"
          label="Instrument"
          anyLabel="Any instrument"
          value={filters.instrumentId}
          onChange={(e) => setFilters({ instrumentId: e.target.value })}
          options={instruments.map((i) => ({ value: i.id, label: i.name }))}
        />
        <div className="flex flex-col gap-1">
          <label htmlFor="run-search" className="text-sm font-medium">
            Search
          </label>
          <input
            id="run-search"
            type="search"
            value={q}
            onChange={(e) => setQ(e.target.value)}
            placeholder="sample, author, notes"
            maxLength={200}
            className={`${inputClass} w-52`}
          />
        </div>
        {filtered ? (
          <button type="button" onClick={clear} className="rounded px-2 py-1.5 text-sm underline">
            Clear the filters
          </button>
        ) : null}
        <span className="muted pb-2 text-xs" aria-live="polite" data-testid="runs-count">
          {isLoading
            ? "Loading…"
            : `${data?.length ?? 0} ${data?.length === 1 ? "run" : "runs"} shown`}
        </span>
      </form>
      {error ? (
        <p role="alert" className="text-sm text-red-700 dark:text-red-300">
          {error.message}
        </p>
      ) : null}
      {data && data.length === 0 ? (
        <div className="panel p-4 text-sm" data-testid="runs-empty">
          {filtered ? (
            <>
              <p className="font-medium">No runs match these filters.</p>
              <button type="button" onClick={clear} className="mt-1 underline">
                Clear the filters
              </button>
            </>
          ) : (
            <p className="muted">
              No runs yet: a run analyses one sample spectrum on a calibration and calls the
              elements it shows.
            </p>
          )}
        </div>
      ) : (
        <TableScroll label="Runs of this notebook" className="panel">
          <table
            className={`w-full text-sm ${isLoading && data ? "opacity-60" : ""}`}
            data-testid="runs-table"
            aria-busy={isLoading || undefined}
          >
            <caption className="sr-only">Runs of this notebook, newest first</caption>
            <thead className="border-b border-[var(--line)] text-left">
              <tr>
                <th scope="col" className="px-3 py-2">
                  Date
                </th>
                <th scope="col" className="min-w-40 px-3 py-2">
                  Sample
                </th>
                <th scope="col" className="px-3 py-2">
                  Status
                </th>
                <th scope="col" className="px-3 py-2">
                  Called present
                </th>
                <th scope="col" className="px-3 py-2">
                  Source
                </th>
                <th scope="col" className="px-3 py-2">
                  Instrument
                </th>
                <th scope="col" className="px-3 py-2">
                  Author
                </th>
              </tr>
            </thead>
            {!data ? (
              <SkeletonRows columns={COLUMNS} label="Loading the runs…" />
            ) : (
              <tbody>
                {data.map((r) => (
                  <tr
                    key={r.id}
                    className="border-b border-[var(--line)] last:border-0"
                    data-testid="run-row"
                  >
                    <td className="whitespace-nowrap px-3 py-2">
                      <Link href={`/runs/${r.id}`} className="underline">
                        {r.createdAt.slice(0, 16).replace("T", " ")}
                      </Link>
                      {r.versionNumber > 1 ? (
                        <span className="muted ml-1 text-xs">v{r.versionNumber}</span>
                      ) : null}
                    </td>
                    <td className="px-3 py-2">
                      {r.spectrumLabel || r.spectrumFileName}
                      {r.spectrumLabel ? (
                        <span className="muted block text-xs">{r.spectrumFileName}</span>
                      ) : null}
                    </td>
                    <td className="px-3 py-2">
                      <RunStatusBadge status={r.status} />
                    </td>
                    <td className="px-3 py-2" data-testid="run-present">
                      {r.present.length ? (
                        r.present.join(", ")
                      ) : (
                        <span className="muted">none</span>
                      )}
                    </td>
                    <td className="px-3 py-2">{r.source}</td>
                    <td className="px-3 py-2">{r.instrumentName}</td>
                    <td className="px-3 py-2">{r.authorName ?? "—"}</td>
                  </tr>
                ))}
              </tbody>
            )}
          </table>
        </TableScroll>
      )}
    </section>
  );
}
