// Whether a request comes from a page of this site: its Origin's host against the host it was sent to
// (the first X-Forwarded-Host a proxy set, else Host), the comparison Next.js makes for server actions.
// The proxy (server actions) and the route-handler wrapper (cookie requests to the API) both ask it. A
// browser sends Origin with every cross-site POST and cannot forge X-Forwarded-Host on one: a form sets
// no headers, and a script's custom header needs a CORS preflight that this app never grants.

/** absent: no Origin header (not a cross-site browser request); malformed: an Origin that is no URL. */
export type OriginVerdict = "absent" | "same" | "foreign" | "malformed";

export function originVerdict(headers: { get(name: string): string | null }): OriginVerdict {
  const origin = headers.get("origin");
  if (!origin) return "absent";
  const host = headers.get("x-forwarded-host")?.split(",")[0]?.trim() || headers.get("host");
  let originHost: string;
  try {
    originHost = new URL(origin).host;
  } catch {
    return "malformed";
  }
  return originHost === host ? "same" : "foreign";
}
