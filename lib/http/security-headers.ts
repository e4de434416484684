// The security headers of every answer, in one place: the pages' Content-Security-Policy (a fresh
// script nonce per request, set by proxy.ts), the fixed headers that next.config.js adds to every
// path, and HSTS when the app is served over HTTPS. Pure: no Next.js imports, so tests read it.

/** Sent with every answer (next.config.js `headers()`), pages and API alike. */
export const FIXED_SECURITY_HEADERS: ReadonlyArray<{ key: string; value: string }> = [
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
  // The app uses none of these; a page that someone manages to inject cannot ask for them either.
  {
    key: "Permissions-Policy",
    value:
      "camera=(), microphone=(), geolocation=(), payment=(), usb=(), serial=(), bluetooth=(), interest-cohort=()",
  },
  // For browsers older than CSP's frame-ancestors.
  { key: "X-Frame-Options", value: "DENY" },
];

/** API answers are data, never documents: nothing loads from them and nothing may frame them. */
export const API_CONTENT_SECURITY_POLICY = "default-src 'none'; frame-ancestors 'none'";

/** Answers under /api carry personal data: no shared or browser cache keeps them. */
export const API_CACHE_CONTROL = "no-store";

export interface PagePolicyOptions {
  /** `next dev` evaluates modules with eval (React's development build): allowed there only. */
  development?: boolean;
  /** Served over HTTPS: ask the browser to upgrade any plain-HTTP subresource. */
  https?: boolean;
}

/**
 * The pages' policy. Scripts run only with this request's nonce ('strict-dynamic' lets them load
 * Next's chunks and the chart library); styles allow inline attributes because Plotly draws with
 * them; images allow data: and blob: for the charts' PNG export; nothing may frame a page.
 */
export function pageContentSecurityPolicy(
  nonce: string,
  { development = false, https = false }: PagePolicyOptions = {},
): string {
  const directives = [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${development ? " 'unsafe-eval'" : ""}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "worker-src 'self' blob:",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ];
  if (https) directives.push("upgrade-insecure-requests");
  return directives.join("; ");
}

/** A fresh nonce: 16 random bytes in base64, as CSP's nonce-source expects. */
export function newNonce(): string {
  const bytes = new Uint8Array(16);
  crypto.getRandomValues(bytes);
  return btoa(String.fromCharCode(...bytes));
}

/**
 * HSTS, only when the app's own address (APP_URL) is https: a browser ignores it over plain HTTP
 * anyway, and sending it from a loopback demo would pin http://127.0.0.1 users to a TLS port that
 * does not exist. One year, subdomains included (common practice); no preload list.
 */
export function strictTransportSecurity(appUrl: string | undefined): string | null {
  return appUrl?.startsWith("https://") ? "max-age=31536000; includeSubDomains" : null;
}
