// The security headers: the pages' policy allows scripts only with the request's nonce, forbids
// framing, and allows inline styles (Plotly) but nothing from other hosts; HSTS only behind HTTPS;
// next.config.js (plain JavaScript) sends the same fixed headers as lib/http/security-headers.ts says.
import { createRequire } from "node:module";
import { describe, expect, it } from "vitest";
import {
  API_CACHE_CONTROL,
  API_CONTENT_SECURITY_POLICY,
  FIXED_SECURITY_HEADERS,
  newNonce,
  pageContentSecurityPolicy,
  strictTransportSecurity,
} from "@/lib/http/security-headers";

const require = createRequire(import.meta.url);

describe("pageContentSecurityPolicy", () => {
  const policy = pageContentSecurityPolicy("abc123==");
  const directives = new Map(
    policy.split("; ").map((d) => [d.split(" ")[0], d.split(" ").slice(1)]),
  );

  it("runs scripts only with the nonce (no unsafe-inline, no unsafe-eval in production)", () => {
    expect(directives.get("script-src")).toEqual([
      "'self'",
      "'nonce-abc123=='",
      "'strict-dynamic'",
    ]);
    expect(policy).not.toContain("unsafe-eval");
    expect(pageContentSecurityPolicy("n", { development: true })).toContain("'unsafe-eval'");
  });

  it("forbids framing, plugins and foreign form targets, and names no other host", () => {
    expect(directives.get("frame-ancestors")).toEqual(["'none'"]);
    expect(directives.get("object-src")).toEqual(["'none'"]);
    expect(directives.get("form-action")).toEqual(["'self'"]);
    expect(policy).not.toMatch(/https?:/);
  });

  it("lets Plotly style inline and export PNGs", () => {
    expect(directives.get("style-src")).toContain("'unsafe-inline'");
    expect(directives.get("img-src")).toEqual(expect.arrayContaining(["data:", "blob:"]));
  });

  it("upgrades subresources only behind HTTPS", () => {
    expect(policy).not.toContain("upgrade-insecure-requests");
    expect(pageContentSecurityPolicy("n", { https: true })).toContain("upgrade-insecure-requests");
  });
});

describe("newNonce", () => {
  it("is fresh each time and 16 bytes of base64", () => {
    const nonces = new Set(Array.from({ length: 100 }, () => newNonce()));
    expect(nonces.size).toBe(100);
    for (const nonce of nonces) expect(Buffer.from(nonce, "base64")).toHaveLength(16);
  });
});

describe("strictTransportSecurity", () => {
  it("is sent only when the app's address is https", () => {
    expect(strictTransportSecurity("https://emberline.lab.example")).toBe(
      "max-age=31536000; includeSubDomains",
    );
    expect(strictTransportSecurity("http://127.0.0.1:3000")).toBeNull();
    expect(strictTransportSecurity(undefined)).toBeNull();
  });
});

describe("next.config.js headers", () => {
  it("match lib/http/security-headers.ts", async () => {
    const config = require("../../../next.config.js") as {
      headers: () => Promise<{ source: string; headers: { key: string; value: string }[] }[]>;
    };
    const rules = await config.headers();
    expect(rules.find((r) => r.source === "/:path*")?.headers).toEqual(FIXED_SECURITY_HEADERS);
    expect(rules.find((r) => r.source === "/api/:path*")?.headers).toEqual([
      { key: "Content-Security-Policy", value: API_CONTENT_SECURITY_POLICY },
    ]);
    // Cache-Control is apiRoute's (lib/http/api-handler.ts), so that a route's own value is kept.
    expect(API_CACHE_CONTROL).toBe("no-store");
  });
});
