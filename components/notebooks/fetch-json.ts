// The SWR fetcher of the notebooks area: JSON from our API routes, with the API's message on failure.
export async function fetchJson<T>(url: string): Promise<T> {
  const response = await fetch(url, { headers: { accept: "application/json" } });
  if (!response.ok) {
    const body = (await response.json().catch(() => null)) as {
      error?: { message?: string };
    } | null;
    throw new Error(
      body?.error?.message ?? `The list could not be loaded (HTTP ${response.status}).`,
    );
  }
  return response.json() as Promise<T>;
}
