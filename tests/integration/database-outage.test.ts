// A database outage: while the test's PostgreSQL is stopped, API answers are 503 with Retry-After and
// a sentence (never a 500) and /api/health says the database is unreachable; once it is started
// again the same session works without restarting the app. The cluster is stopped with pg_ctl the
// way db/cluster.mjs runs it (as the postgres user when root) and always started again afterwards.
import { afterAll, describe, expect, it } from "vitest";
import { FLAME_SCREENING, signInDemo, teamIdOf } from "./support/accounts";
import { startDatabase, stopDatabase } from "./support/cluster";
import { closeDb } from "./support/database";
import { ApiClient, type ErrorBody } from "./support/http-client";

async function waitForHealth(client: ApiClient, status: number, timeoutMs: number) {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const reply = await client.get<{ database: { status: string } }>("/api/health");
    if (reply.status === status || Date.now() > until) return reply;
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
}

let stopped = false;

afterAll(async () => {
  // Whatever happened above, later test files need their database back.
  if (stopped) startDatabase();
  await closeDb();
});

describe("a database outage", () => {
  it("answers 503 with Retry-After while PostgreSQL is down, and recovers when it is back", async () => {
    const chemist = await signInDemo("chemist");
    const teamId = await teamIdOf(chemist, FLAME_SCREENING);
    const anonymous = new ApiClient();
    const healthy = await anonymous.get<{
      status: string;
      app: { status: string };
      database: { status: string };
    }>("/api/health");
    expect(healthy.status).toBe(200);
    expect(healthy.body).toMatchObject({
      status: "ok",
      app: { status: "ok" },
      database: { status: "ok" },
    });
    // No addresses, versions or connection strings in the health answer.
    expect(JSON.stringify(healthy.body)).not.toMatch(/postgres|127\.0\.0\.1|password|version/i);

    await closeDb();
    stopDatabase();
    stopped = true;

    const health = await waitForHealth(anonymous, 503, 10_000);
    expect(health.status).toBe(503);
    expect(Number(health.headers.get("retry-after"))).toBeGreaterThan(0);
    expect(health.body).toMatchObject({
      status: "unavailable",
      app: { status: "ok" },
      database: { status: "unreachable" },
    });

    const read = await chemist.get<ErrorBody>("/api/me");
    const write = await chemist.post<ErrorBody>("/api/notebooks", {
      teamId,
      title: "written during an outage",
    });
    const signIn = await anonymous.post<ErrorBody>("/api/session", {
      email: "nobody-during-outage@test.emberline.example",
      password: "not the password",
    });
    for (const [what, reply] of [
      ["read", read],
      ["write", write],
      ["sign-in", signIn],
    ] as const) {
      expect(reply.status, `${what}: ${JSON.stringify(reply.body)}`).toBe(503);
      expect(Number(reply.headers.get("retry-after")), what).toBeGreaterThan(0);
      expect(reply.body.error.code).toBe("unavailable");
      expect(reply.body.error.message).toMatch(/^The database is unreachable/);
    }

    startDatabase();
    stopped = false;

    const back = await waitForHealth(anonymous, 200, 30_000);
    expect(back.status).toBe(200);
    expect(back.body.database.status).toBe("ok");
    // The same session works again, and the write refused during the outage was never stored.
    const me = await chemist.get("/api/me");
    expect(me.status).toBe(200);
    const notebooks = await chemist.get<{ title: string }[] | { notebooks: { title: string }[] }>(
      `/api/notebooks?teamId=${teamId}`,
    );
    expect(notebooks.status).toBe(200);
    expect(JSON.stringify(notebooks.body)).not.toContain("written during an outage");
  });
});
