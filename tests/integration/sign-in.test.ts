// Sign-in, the session cookie and sign-out over the real HTTP API, against the test database.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ApiClient, parseSetCookie, testAddress, type ErrorBody } from "./support/http-client";
import {
  DEMO,
  DEMO_PASSWORD,
  FLAME_SCREENING,
  createAccountThroughInvitation,
  signInDemo,
  uniqueEmail,
  type FreshAccount,
  type Me,
} from "./support/accounts";
import { closeDb } from "./support/database";

const GENERIC_FAILURE = "The e-mail address or password is not right.";

let lead: ApiClient;
let person: FreshAccount;

beforeAll(async () => {
  lead = await signInDemo("labLead");
  // Wrong-password checks use a fresh account, so the demo accounts never near their throttle.
  person = await createAccountThroughInvitation(lead, { label: "sign-in" });
});

afterAll(closeDb);

describe("POST /api/session", () => {
  it("signs in with the right password and answers with the person and their teams", async () => {
    const client = new ApiClient();
    const reply = await client.post<Me>("/api/session", {
      email: DEMO.labLead.email,
      password: DEMO_PASSWORD,
    });
    expect(reply.status).toBe(200);
    expect(reply.body.email).toBe(DEMO.labLead.email);
    expect(reply.body.name).toBe(DEMO.labLead.name);
    expect(reply.body.teams.map((t) => [t.name, t.role]).sort()).toEqual([
      ["Arc and Spark Bench", "supervisor"],
      [FLAME_SCREENING, "lab_lead"],
    ]);
    const me = await client.get<Me>("/api/me");
    expect(me.status).toBe(200);
    expect(me.body.id).toBe(reply.body.id);
  });

  it("accepts the e-mail address in another case and with spaces around it", async () => {
    const reply = await new ApiClient().post("/api/session", {
      email: `  ${DEMO.chemist.email.toUpperCase()} `,
      password: DEMO_PASSWORD,
    });
    expect(reply.status).toBe(200);
  });

  it("gives a wrong password and an unknown account the same status and message (no enumeration)", async () => {
    const address = testAddress();
    const wrong = await new ApiClient(address).post<ErrorBody>("/api/session", {
      email: person.email,
      password: "not the password at all",
    });
    const unknown = await new ApiClient(address).post<ErrorBody>("/api/session", {
      email: uniqueEmail("nobody"),
      password: "not the password at all",
    });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(wrong.status);
    expect(wrong.body.error.message).toBe(GENERIC_FAILURE);
    expect(unknown.body).toEqual(wrong.body);
    expect(wrong.setCookies).toEqual([]);
    expect(unknown.setCookies).toEqual([]);
  });

  it("slows one address's guesses at one account (429 after 3 failures) but never locks the owner out elsewhere", async () => {
    const victim = await createAccountThroughInvitation(lead, { label: "throttled" });
    const guesser = new ApiClient(testAddress());
    const statuses: number[] = [];
    for (let attempt = 1; attempt <= 20; attempt++) {
      statuses.push(
        (await guesser.post("/api/session", { email: victim.email, password: `wrong ${attempt}` }))
          .status,
      );
    }
    // The first three are checked and wrong; then the pair must wait (1 s, 2 s, 4 s… after each failure).
    expect(statuses.slice(0, 3)).toEqual([401, 401, 401]);
    expect(statuses.slice(3)).toContain(429);
    expect(statuses.every((status) => status === 401 || status === 429)).toBe(true);
    // The owner, from their own address, signs in at once with the right password.
    const owner = await new ApiClient(testAddress()).post<Me>("/api/session", {
      email: victim.email,
      password: victim.password,
    });
    expect(owner.status).toBe(200);
  });

  it("doubles the wait after each further failure of a pair, and then refuses even the right password", async () => {
    const victim = await createAccountThroughInvitation(lead, { label: "delayed" });
    const guesser = new ApiClient(testAddress());
    const waits: number[] = [];
    let failures = 0;
    while (failures < 6) {
      const reply = await guesser.post("/api/session", {
        email: victim.email,
        password: `wrong ${failures}`,
      });
      if (reply.status === 401) {
        failures++;
        continue;
      }
      expect(reply.status).toBe(429);
      const retryAfter = Number(reply.headers.get("retry-after"));
      waits.push(retryAfter);
      await new Promise((resolve) => setTimeout(resolve, retryAfter * 1000));
    }
    // Waits after failures 3, 4 and 5 (1 s, 2 s, 4 s; rounded up to whole seconds by Retry-After).
    expect(waits).toHaveLength(3);
    expect(waits[1]).toBeGreaterThanOrEqual(waits[0]);
    expect(waits[2]).toBeGreaterThan(waits[0]);
    expect(waits[2]).toBeLessThanOrEqual(4);
    // After the 6th failure the pair waits 8 s: the right password is not even checked.
    const blocked = await guesser.post<ErrorBody>("/api/session", {
      email: victim.email,
      password: victim.password,
    });
    expect(blocked.status).toBe(429);
    expect(blocked.body.error.code).toBe("rate_limited");
    expect(blocked.body.error.message).toMatch(
      /^Too many failed password attempts from here\. Try again in \d+ seconds?/,
    );
    expect(Number(blocked.headers.get("retry-after"))).toBeGreaterThan(4);
    expect(blocked.setCookies).toEqual([]);
  }, 120_000);

  it("throttles an address after 20 failures, whatever account it tries next", async () => {
    const client = new ApiClient(testAddress());
    for (let attempt = 1; attempt <= 20; attempt++) {
      const reply = await client.post("/api/session", {
        email: uniqueEmail("spray"),
        password: "guessing wildly",
      });
      expect(reply.status, `attempt ${attempt}`).toBe(401);
    }
    const blocked = await client.post<ErrorBody>("/api/session", {
      email: DEMO.chemist.email,
      password: DEMO_PASSWORD,
    });
    expect(blocked.status).toBe(429);
    // Until the oldest of the 20 failures leaves the 15-minute window.
    const retryAfter = Number(blocked.headers.get("retry-after"));
    expect(retryAfter).toBeGreaterThan(60);
    expect(retryAfter).toBeLessThanOrEqual(15 * 60);
    // The same account from another address is not affected.
    const elsewhere = await new ApiClient().post("/api/session", {
      email: DEMO.chemist.email,
      password: DEMO_PASSWORD,
    });
    expect(elsewhere.status).toBe(200);
  }, 240_000);
});

describe("the session cookie", () => {
  it("is HttpOnly, SameSite=Lax, Path=/ and not Secure over plain HTTP", async () => {
    const reply = await new ApiClient().post("/api/session", {
      email: DEMO.supervisor.email,
      password: DEMO_PASSWORD,
    });
    expect(reply.status).toBe(200);
    const sessionCookies = reply.setCookies
      .map(parseSetCookie)
      .filter((c) => c.name === "emberline_session");
    expect(sessionCookies).toHaveLength(1);
    const [cookie] = sessionCookies;
    expect(cookie.value.length).toBeGreaterThan(20);
    expect(cookie.attributes.has("httponly")).toBe(true);
    expect(cookie.attributes.get("samesite")?.toLowerCase()).toBe("lax");
    expect(cookie.attributes.get("path")).toBe("/");
    // The test server runs at http://127.0.0.1, where a Secure cookie would never be sent back.
    expect(cookie.attributes.has("secure")).toBe(false);
    // The session lasts 12 hours (lib/auth/session.ts), so the cookie must not outlive it.
    const maxAge = Number(cookie.attributes.get("max-age"));
    expect(maxAge).toBeGreaterThan(0);
    expect(maxAge).toBeLessThanOrEqual(12 * 3600);
  });

  it("cannot be forged: a tampered cookie is treated as no session", async () => {
    const client = await signInDemo("chemist");
    const value = client.cookie("emberline_session")!;
    client.setCookie("emberline_session", `${value.slice(0, -4)}AAAA`);
    expect((await client.get("/api/me")).status).toBe(401);
  });
});

describe("DELETE /api/session", () => {
  it("clears the cookie, after which /api/me answers 401", async () => {
    const client = await signInDemo("supervisor");
    expect((await client.get("/api/me")).status).toBe(200);
    const reply = await client.delete("/api/session");
    expect(reply.status).toBe(204);
    const cleared = reply.setCookies
      .map(parseSetCookie)
      .find((c) => c.name === "emberline_session");
    expect(cleared, "a Set-Cookie that removes the session cookie").toBeDefined();
    const removed = cleared!.value === "" || cleared!.attributes.get("max-age") === "0";
    expect(removed).toBe(true);
    expect(client.cookie("emberline_session")).toBeUndefined();
    const me = await client.get<ErrorBody>("/api/me");
    expect(me.status).toBe(401);
    expect(me.body.error.code).toBe("unauthenticated");
  });

  it("answers 204 for someone not signed in", async () => {
    expect((await new ApiClient().delete("/api/session")).status).toBe(204);
  });
});
