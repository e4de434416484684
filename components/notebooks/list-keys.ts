// The API addresses the notebooks area's lists fetch, built the same way on the server (for SWR's
// fallback) and in the browser, so the first paint's data is found under the key the browser asks for.
export const RUN_FILTER_KEYS = ["status", "species", "instrumentId", "q"] as const;
export type RunFilterKey = (typeof RUN_FILTER_KEYS)[number];

/** The query string of the filters that are set, in a fixed order. */
export function filterQuery(
  values: Partial<Record<string, string>>,
  keys: readonly string[],
  extra: Record<string, string> = {},
): string {
  const query = new URLSearchParams(extra);
  for (const key of keys) {
    const value = values[key]?.trim();
    if (value) query.set(key, value);
  }
  return query.toString();
}

export function runsKey(notebookId: string, values: Partial<Record<string, string>>): string {
  const query = filterQuery(values, RUN_FILTER_KEYS);
  return `/api/notebooks/${notebookId}/runs${query ? `?${query}` : ""}`;
}

export function notebooksKey(teamId: string, q: string | undefined): string {
  return `/api/notebooks?${filterQuery({ q }, ["q"], { teamId })}`;
}

export function spectraKey(teamId: string, instrumentId: string, kind: "lamp" | "sample"): string {
  return `/api/spectra?${new URLSearchParams({ teamId, instrumentId, kind })}`;
}

/** One value of a page's searchParams (the first when repeated). */
export function oneParam(value: string | string[] | undefined): string {
  return (Array.isArray(value) ? value[0] : value) ?? "";
}
