// HTTP hardening against the served app: security headers on pages and API answers, bodies over
// their route's cap refused before they are read in full (declared and chunked), ids and query
// values that used to give 500 (a broken %-escape, NUL and lone surrogates, far-future dates), and
// the release export's formula guard.
import http from "node:http";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { signedIn, signInDemo, FLAME_SCREENING, teamIdOf } from "./support/accounts";
import { closeDb } from "./support/database";
import { ApiClient, APP_URL, type ErrorBody } from "./support/http-client";
import { ensureOutsider, OUTSIDER } from "./support/outsider";

const { hostname, port } = new URL(APP_URL);

interface EarlyAnswer {
  status: number;
  body: string;
  /** Bytes of the body written before the answer arrived. */
  sentBytes: number;
  /** Whether the whole body had been written when the answer arrived. */
  finished: boolean;
}

/**
 * Sends a chunked body (no Content-Length) of `totalBytes` in `chunkBytes` pieces, waiting for the
 * socket to drain and a moment between pieces, and stops as soon as an answer arrives.
 */
function sendChunked(
  path: string,
  totalBytes: number,
  chunkBytes: number,
  headers: Record<string, string> = {},
): Promise<EarlyAnswer> {
  return new Promise((resolve, reject) => {
    let sentBytes = 0;
    let answered = false;
    const request = http.request({
      hostname,
      port,
      path,
      method: "POST",
      headers: { "content-type": "application/json", ...headers },
    });
    request.on("response", (response) => {
      answered = true;
      const finished = sentBytes >= totalBytes;
      let body = "";
      response.setEncoding("utf8");
      response.on("data", (chunk: string) => (body += chunk));
      response.on("end", () => {
        resolve({ status: response.statusCode ?? 0, body, sentBytes, finished });
        request.destroy();
      });
    });
    request.on("error", (error) => {
      // The server may close the connection after answering; only an error before any answer counts.
      if (!answered) reject(error);
    });
    const chunk = Buffer.alloc(chunkBytes, "x");
    const writeMore = () => {
      if (answered || request.destroyed) return;
      if (sentBytes >= totalBytes) return void request.end();
      sentBytes += chunk.length;
      const flushed = request.write(chunk);
      if (flushed) setTimeout(writeMore, 2);
      else request.once("drain", () => setTimeout(writeMore, 2));
    };
    writeMore();
  });
}

/** Sends only the head of a request that declares a huge body, and waits for the answer. */
function declareHugeBody(
  path: string,
  declaredBytes: number,
): Promise<{ status: number; body: string }> {
  return new Promise((resolve, reject) => {
    const request = http.request({
      hostname,
      port,
      path,
      method: "POST",
      headers: { "content-type": "application/json", "content-length": String(declaredBytes) },
    });
    request.on("response", (response) => {
      let body = "";
      response.setEncoding("utf8");
      response.on("data", (chunk: string) => (body += chunk));
      response.on("end", () => {
        resolve({ status: response.statusCode ?? 0, body });
        request.destroy();
      });
    });
    request.on("error", reject);
    request.write("{");
  });
}

afterAll(() => closeDb());

describe("security headers", () => {
  it("a page carries a nonce-based CSP that forbids framing, and the fixed headers", async () => {
    const first = await fetch(`${APP_URL}/sign-in`);
    const second = await fetch(`${APP_URL}/sign-in`);
    const html = await first.text();
    const policy = first.headers.get("content-security-policy") ?? "";
    const nonce = /'nonce-([^']+)'/.exec(policy)?.[1];
    expect(nonce, policy).toBeTruthy();
    expect(policy).toContain("frame-ancestors 'none'");
    expect(policy).not.toContain("'unsafe-inline' 'nonce"); // scripts need the nonce, not unsafe-inline
    expect(second.headers.get("content-security-policy")).not.toBe(policy);
    // Every script Next.js writes into the page carries this request's nonce.
    const scripts = [...html.matchAll(/<script\b[^>]*>/g)].map((m) => m[0]);
    expect(scripts.length).toBeGreaterThan(0);
    for (const tag of scripts) expect(tag, tag).toContain(`nonce="${nonce}"`);
    expect(first.headers.get("x-content-type-options")).toBe("nosniff");
    expect(first.headers.get("referrer-policy")).toBe("strict-origin-when-cross-origin");
    expect(first.headers.get("permissions-policy")).toContain("camera=()");
    expect(first.headers.get("x-frame-options")).toBe("DENY");
    // Served over plain HTTP (APP_URL is http://), so no HSTS.
    expect(first.headers.get("strict-transport-security")).toBeNull();
  });

  it("the password-confirmed sign-off page cannot be framed", async () => {
    const supervisor = await signInDemo("supervisor");
    const response = await fetch(`${APP_URL}/review`, {
      headers: { cookie: `emberline_session=${supervisor.cookie("emberline_session")}` },
    });
    expect(response.status).toBe(200);
    expect(response.headers.get("content-security-policy")).toContain("frame-ancestors 'none'");
    expect(response.headers.get("x-frame-options")).toBe("DENY");
  });

  it("authenticated API answers are not cached and not framable", async () => {
    const chemist = await signInDemo("chemist");
    const me = await chemist.get("/api/me");
    expect(me.status).toBe(200);
    expect(me.headers.get("cache-control")).toBe("no-store");
    expect(me.headers.get("x-content-type-options")).toBe("nosniff");
    expect(me.headers.get("content-security-policy")).toBe(
      "default-src 'none'; frame-ancestors 'none'",
    );
    const anonymous = await new ApiClient().get("/api/me");
    expect(anonymous.status).toBe(401);
    expect(anonymous.headers.get("cache-control")).toBe("no-store");
  });
});

describe("request bodies over their cap", () => {
  it("a declared 200 MB sign-in body is refused at once, with a sentence naming the cap", async () => {
    const started = Date.now();
    const reply = await declareHugeBody("/api/session", 200 * 1024 * 1024);
    expect(reply.status).toBe(413);
    expect((JSON.parse(reply.body) as ErrorBody).error.message).toBe(
      "The request body is larger than the 4 KB this address accepts.",
    );
    expect(Date.now() - started).toBeLessThan(10_000);
  });

  it("a chunked sign-in body without Content-Length is answered 413 while the client is still sending", async () => {
    const total = 64 * 1024 * 1024;
    const answer = await sendChunked("/api/session", total, 16 * 1024);
    expect(answer.status).toBe(413);
    expect(answer.finished).toBe(false);
    expect(answer.sentBytes).toBeLessThan(total / 4);
    expect((JSON.parse(answer.body) as ErrorBody).error.message).toMatch(/larger than the 4 KB/);
  });

  it("a chunked upload over the 16 MB cap is answered 413 before it is all sent", async () => {
    const total = 160 * 1024 * 1024;
    const answer = await sendChunked("/api/spectra/preview", total, 256 * 1024, {
      "content-type": "multipart/form-data; boundary=----emberline",
    });
    expect(answer.status).toBe(413);
    expect(answer.finished).toBe(false);
    expect(answer.sentBytes).toBeLessThan(total / 2);
    expect((JSON.parse(answer.body) as ErrorBody).error.message).toBe(
      "The upload is larger than the 16 MB a spectrum file may have.",
    );
  });

  it("a small JSON route refuses a 20 MB body before reading it", async () => {
    const chemist = await signInDemo("chemist");
    const reply = await chemist.request<ErrorBody>("POST", "/api/notebooks", {
      rawBody: JSON.stringify({ title: "x".repeat(20 * 1024 * 1024) }),
    });
    expect(reply.status).toBe(413);
    expect(reply.body.error.message).toBe(
      "The request body is larger than the 128 KB this address accepts.",
    );
  });
});

describe("hostile ids and values", () => {
  it("a broken %-escape as an id answers a clean 400 on API and page routes, never Next's plain 500", async () => {
    const chemist = await signInDemo("chemist");
    for (const path of [
      "/api/runs/%C0%AF",
      "/api/notebooks/%C0%AF/runs",
      "/api/releases/%E0%A4%A/export",
      "/api/spectra/%FF",
    ]) {
      const reply = await chemist.get<ErrorBody>(path);
      expect(reply.status, path).toBe(400);
      expect(reply.body.error.code).toBe("validation");
    }
    const page = await fetch(`${APP_URL}/runs/%C0%AF`, {
      headers: { cookie: `emberline_session=${chemist.cookie("emberline_session")}` },
      redirect: "manual",
    });
    expect(page.status).toBe(400);
  });

  it("an id that is not a UUID answers 404 on every kind of id route", async () => {
    const chemist = await signInDemo("chemist");
    for (const path of [
      "/api/runs/1",
      "/api/runs/..%2f..%2fetc",
      "/api/instruments/abc",
      "/api/tokens/not-a-uuid",
    ]) {
      const method = path.startsWith("/api/tokens") ? "DELETE" : "GET";
      expect((await chemist.request(method, path)).status, path).toBe(404);
    }
  });

  it("NUL and lone surrogates in a token name or a notebook title answer 400 with a field message", async () => {
    const chemist = await signInDemo("chemist");
    const teamId = await teamIdOf(chemist, FLAME_SCREENING);
    const token = await chemist.post<ErrorBody>("/api/tokens", { name: "ci\u0000bot" });
    expect(token.status).toBe(400);
    expect(token.body.error.fieldErrors?.name?.[0]).toMatch(/control characters/);
    // A lone surrogate written as a JSON escape reaches the server as one.
    const notebook = await chemist.request<ErrorBody>("POST", "/api/notebooks", {
      rawBody: `{"teamId":"${teamId}","title":"flame \\ud800"}`,
    });
    expect(notebook.status).toBe(400);
    expect(notebook.body.error.fieldErrors?.title).toBeDefined();
  });

  it("a server action posted from another site answers 403, not Next's 500", async () => {
    const chemist = await signInDemo("chemist");
    const post = (origin: string) =>
      fetch(`${APP_URL}/notebooks`, {
        method: "POST",
        headers: {
          "next-action": "0".repeat(40),
          origin,
          "content-type": "text/plain;charset=UTF-8",
          cookie: `emberline_session=${chemist.cookie("emberline_session")}`,
        },
        body: "[]",
        redirect: "manual",
      });
    const foreign = await post("http://evil.example");
    expect(foreign.status).toBe(403);
    expect(await foreign.text()).toBe("Cross-site form posts are not accepted.");
    // From our own origin the same (unknown) action is Next's to answer, and not with a 403.
    expect((await post(APP_URL)).status).not.toBe(403);
  });

  it("the audit trail refuses a date beyond its range with 400", async () => {
    const lead = await signInDemo("labLead");
    const reply = await lead.get<ErrorBody>("/api/audit?to=9999-12-31");
    expect(reply.status).toBe(400);
    expect(reply.body.error.fieldErrors?.to?.[0]).toMatch(/between 1970 and 2999/);
  });
});

describe("the release export", () => {
  let lead: ApiClient;
  let teamId: string;
  beforeAll(async () => {
    teamId = (await ensureOutsider()).teamId;
    lead = await signedIn(OUTSIDER.email, OUTSIDER.password);
  });

  it("guards a formula in a source field like the other CSVs", async () => {
    const draft = await lead.post<{ id: string }>("/api/releases/draft", { teamId });
    expect(draft.status, JSON.stringify(draft.body)).toBeLessThan(300);
    const source = `=HYPERLINK("http://evil.example/","NIST") ${Date.now()}`;
    const added = await lead.post(`/api/releases/${draft.body.id}/lines`, {
      line: { species: "Na I", airNm: 400 + (Date.now() % 100000) / 1000, source },
      reason: "formula guard test",
    });
    expect(added.status, JSON.stringify(added.body)).toBe(201);
    const exported = await fetch(`${APP_URL}/api/releases/${draft.body.id}/export`, {
      headers: { cookie: `emberline_session=${lead.cookie("emberline_session")}` },
    });
    const csv = await exported.text();
    expect(exported.status).toBe(200);
    const row = csv.split("\n").find((line) => line.includes("evil.example"));
    expect(row).toBeDefined();
    expect(row).toContain(`'=HYPERLINK`);
    expect(row).not.toMatch(/(^|,)"?=HYPERLINK/);
  });
});
