// Account takeover paths, closed: the mail viewer never shows another person's secret link, a new
// password ends every access token, removing a member takes effect at once, forwarded addresses are
// believed only from the configured proxy, and reset requests are capped.
import http from "node:http";
import { randomInt } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { APP_URL, ApiClient, testAddress, type ErrorBody } from "./support/http-client";
import {
  DEMO,
  FLAME_SCREENING,
  createAccountThroughInvitation,
  signInDemo,
  signedIn,
  strongPassword,
  teamIdOf,
  uniqueEmail,
  type FreshAccount,
  type Me,
} from "./support/accounts";
import {
  extractLinkToken,
  mailTo,
  readMail,
  waitForMail,
  type StoredMail,
} from "./support/mailbox";
import { closeDb, db } from "./support/database";

const RESET_SUBJECT = /^Reset your Emberline password$/;
// The secret part of every reset and invitation link the app mails.
const SECRET_LINK = /\/(?:reset-password|invitations)\/([A-Za-z0-9_-]{20,})/g;

let lead: ApiClient;
let flameTeamId: string;

beforeAll(async () => {
  lead = await signInDemo("labLead");
  flameTeamId = await teamIdOf(lead, FLAME_SCREENING);
});

afterAll(closeDb);

async function resetToken(person: FreshAccount): Promise<string> {
  const before = mailTo(person.email).filter((m) => RESET_SUBJECT.test(m.subject)).length;
  expect((await new ApiClient().post("/api/password-reset", { email: person.email })).status).toBe(
    202,
  );
  const mail = await waitForMail({ to: person.email, subject: RESET_SUBJECT, skip: before });
  return extractLinkToken(mail.text, "/reset-password/");
}

/**
 * A POST from another loopback address (127.x.y.z, not the test server's trusted proxy 127.0.0.1),
 * so the server sees an untrusted direct peer whatever X-Forwarded-For says.
 */
function postFrom(
  localAddress: string,
  path: string,
  json: unknown,
  headers: Record<string, string> = {},
) {
  const url = new URL(path, APP_URL);
  const body = JSON.stringify(json);
  return new Promise<{ status: number; retryAfter: string | undefined }>((resolve, reject) => {
    const request = http.request(
      {
        host: url.hostname,
        port: url.port,
        path: url.pathname,
        method: "POST",
        localAddress,
        headers: {
          "content-type": "application/json",
          "content-length": Buffer.byteLength(body),
          ...headers,
        },
      },
      (response) => {
        response.resume();
        response.on("end", () =>
          resolve({
            status: response.statusCode ?? 0,
            retryAfter: response.headers["retry-after"] as string | undefined,
          }),
        );
      },
    );
    request.on("error", reject);
    request.end(body);
  });
}

const untrustedPeer = () => `127.${randomInt(1, 255)}.${randomInt(0, 256)}.${randomInt(2, 255)}`;

describe("the outgoing-mail viewer", () => {
  it("never shows a lab lead another person's reset or invitation secret, only a masked link", async () => {
    const person = await createAccountThroughInvitation(lead, { label: "masked" });
    const token = await resetToken(person);
    const inviteeEmail = uniqueEmail("masked-invitee");
    expect(
      (
        await lead.post("/api/invitations", {
          teamId: flameTeamId,
          email: inviteeEmail,
          role: "chemist",
        })
      ).status,
    ).toBe(201);
    const invitation = await waitForMail({
      to: inviteeEmail,
      subject: /invited to Flame Screening/,
    });
    const invitationToken = extractLinkToken(invitation.text, "/invitations/");

    const view = await lead.get<StoredMail[]>("/api/mail");
    expect(view.status).toBe(200);
    // The lead leads Flame Screening, so both messages are listed: with their secrets hidden.
    const resetShown = view.body.find(
      (m) => m.to.includes(person.email) && RESET_SUBJECT.test(m.subject),
    );
    const invitationShown = view.body.find((m) => m.to.includes(inviteeEmail));
    expect(resetShown?.text).toContain(
      "/reset-password/[hidden: only the recipient sees this link]",
    );
    expect(invitationShown?.text).toContain(
      "/invitations/[hidden: only the recipient sees this link]",
    );
    const raw = JSON.stringify(view.body);
    expect(raw).not.toContain(token);
    expect(raw).not.toContain(invitationToken);

    // And no secret of anyone else in the whole mailbox reaches the lead's view.
    const othersSecrets = readMail()
      .filter((m) => !(m.to.length === 1 && m.to[0].toLowerCase() === DEMO.labLead.email))
      .flatMap((m) => [...m.text.matchAll(SECRET_LINK)].map((match) => match[1]));
    expect(othersSecrets.length).toBeGreaterThanOrEqual(2);
    for (const secret of othersSecrets) expect(raw).not.toContain(secret);
  });

  it("keeps another team's lead from reading a lead's reset link (the reported takeover)", async () => {
    // lead@ is a supervisor in Arc and Spark Bench, whose lab lead is bench@.
    const bench = await signedIn("bench@demo.emberline.example", "emberline-demo");
    const before = mailTo(DEMO.labLead.email).filter((m) => RESET_SUBJECT.test(m.subject)).length;
    expect(
      (await new ApiClient().post("/api/password-reset", { email: DEMO.labLead.email })).status,
    ).toBe(202);
    const mail = await waitForMail({
      to: DEMO.labLead.email,
      subject: RESET_SUBJECT,
      skip: before,
    });
    const token = extractLinkToken(mail.text, "/reset-password/");

    const benchView = await bench.get<StoredMail[]>("/api/mail");
    expect(benchView.status).toBe(200);
    expect(benchView.body.some((m) => m.id === mail.id)).toBe(true);
    expect(JSON.stringify(benchView.body)).not.toContain(token);
    // Its one recipient reads it whole.
    const ownView = await lead.get<StoredMail[]>("/api/mail");
    expect(ownView.body.find((m) => m.id === mail.id)?.text).toContain(token);
  });
});

describe("a new password ends every access token", () => {
  async function personWithToken(label: string) {
    const person = await createAccountThroughInvitation(lead, { label });
    const client = await signedIn(person.email, person.password);
    const created = await client.post<{ token: string }>("/api/tokens", { name: "bench script" });
    expect(created.status).toBe(201);
    expect((await new ApiClient().get("/api/me", { bearer: created.body.token })).status).toBe(200);
    return { person, client, token: created.body.token };
  }

  it("after its owner's password reset", async () => {
    const { person, token } = await personWithToken("token-reset");
    const reply = await new ApiClient().post<{
      message: string;
      revoked: { accessTokens: number };
    }>("/api/password-reset/confirm", {
      token: await resetToken(person),
      password: strongPassword(),
    });
    expect(reply.status).toBe(200);
    expect(reply.body.revoked.accessTokens).toBe(1);
    expect(reply.body.message).toContain("Your access token was revoked");
    const after = await new ApiClient().get<ErrorBody>("/api/me", { bearer: token });
    expect(after.status).toBe(401);
  });

  it("after a password change", async () => {
    const { person, client, token } = await personWithToken("token-change");
    const reply = await client.post<{ message: string; revoked: { accessTokens: number } }>(
      "/api/password",
      {
        currentPassword: person.password,
        newPassword: strongPassword(),
      },
    );
    expect(reply.status).toBe(200);
    expect(reply.body.revoked.accessTokens).toBe(1);
    expect(reply.body.message).toContain("Your access token was revoked");
    expect((await new ApiClient().get("/api/me", { bearer: token })).status).toBe(401);
    // The session that made the change stays signed in.
    expect((await client.get("/api/me")).status).toBe(200);
  });
});

describe("removing a member", () => {
  it("takes the team away at once, from the session and from the access token", async () => {
    const person = await createAccountThroughInvitation(lead, { label: "removed" });
    const client = await signedIn(person.email, person.password);
    const { body } = await client.post<{ token: string }>("/api/tokens", {
      name: "removed member's script",
    });
    const path = `/api/notebooks?teamId=${flameTeamId}`;
    expect((await client.get(path)).status).toBe(200);
    expect((await new ApiClient().get(path, { bearer: body.token })).status).toBe(200);

    await db().query("DELETE FROM memberships WHERE user_id = $1 AND team_id = $2", [
      person.userId,
      flameTeamId,
    ]);

    // Memberships are read on every request: no cached role survives the removal.
    expect((await client.get(path)).status).toBe(404);
    expect((await new ApiClient().get(path, { bearer: body.token })).status).toBe(404);
    expect((await client.get<Me>("/api/me")).body.teams).toEqual([]);
  });
});

// 21 argon2 checks (64 MiB each) take a minute or more on a busy two-core machine.
describe("client addresses and the password throttle", () => {
  it("ignores X-Forwarded-For from an untrusted client: rotating it does not get past the address cap", async () => {
    const peer = untrustedPeer();
    const statuses: number[] = [];
    for (let attempt = 1; attempt <= 21; attempt++) {
      const reply = await postFrom(
        peer,
        "/api/session",
        { email: uniqueEmail("rotate"), password: "guessing wildly" },
        { "x-forwarded-for": testAddress(), "x-real-ip": testAddress() },
      );
      statuses.push(reply.status);
    }
    expect(statuses.slice(0, 20)).toEqual(Array(20).fill(401));
    expect(statuses[20]).toBe(429);
    // A trusted proxy (the test client on 127.0.0.1) naming another client is a different address.
    const viaProxy = await new ApiClient(testAddress()).post("/api/session", {
      email: uniqueEmail("rotate"),
      password: "x",
    });
    expect(viaProxy.status).toBe(401);
  }, 240_000);

  it("ignores rotating X-Forwarded-For for one account too: the pair's delay holds", async () => {
    const victim = await createAccountThroughInvitation(lead, { label: "rotate-pair" });
    const peer = untrustedPeer();
    const statuses: number[] = [];
    for (let attempt = 1; attempt <= 5; attempt++) {
      const reply = await postFrom(
        peer,
        "/api/session",
        { email: victim.email, password: `wrong ${attempt}` },
        { "x-forwarded-for": testAddress() },
      );
      statuses.push(reply.status);
    }
    expect(statuses.slice(0, 3)).toEqual([401, 401, 401]);
    expect(statuses.slice(3)).toContain(429);
  });

  it("20 wrong guesses at an account from one address leave its owner free to sign in from another", async () => {
    const victim = await createAccountThroughInvitation(lead, { label: "owner-elsewhere" });
    const attacker = new ApiClient(testAddress());
    for (let attempt = 1; attempt <= 20; attempt++) {
      const reply = await attacker.post("/api/session", {
        email: victim.email,
        password: `guess ${attempt}`,
      });
      expect([401, 429]).toContain(reply.status);
    }
    expect(
      (await attacker.post("/api/session", { email: victim.email, password: victim.password }))
        .status,
    ).toBe(429);
    await signedIn(victim.email, victim.password);
  });

  it("throttles the current-password check of a password change like a sign-in", async () => {
    const person = await createAccountThroughInvitation(lead, { label: "change-throttle" });
    const client = await signedIn(person.email, person.password);
    const statuses: number[] = [];
    for (let attempt = 1; attempt <= 5; attempt++) {
      const reply = await client.post("/api/password", {
        currentPassword: `wrong ${attempt}`,
        newPassword: strongPassword(),
      });
      statuses.push(reply.status);
    }
    expect(statuses.slice(0, 3)).toEqual([400, 400, 400]);
    expect(statuses.slice(3)).toContain(429);
  });

  it("lets a completed reset unlock the account's delays (no CAPTCHA)", async () => {
    const person = await createAccountThroughInvitation(lead, { label: "unlock" });
    const client = new ApiClient(testAddress());
    for (let attempt = 1; attempt <= 4; attempt++)
      await client.post("/api/session", { email: person.email, password: `x ${attempt}` });
    expect(
      (await client.post("/api/session", { email: person.email, password: person.password }))
        .status,
    ).toBe(429);
    const password = strongPassword();
    const reset = await client.post("/api/password-reset/confirm", {
      token: await resetToken(person),
      password,
    });
    expect(reset.status).toBe(200);
    expect((await client.post("/api/session", { email: person.email, password })).status).toBe(200);
  });
});

describe("password-reset requests", () => {
  it("mail an account at most 3 times an hour, answering every request alike", async () => {
    const person = await createAccountThroughInvitation(lead, { label: "reset-cap" });
    for (let request = 1; request <= 5; request++) {
      const reply = await new ApiClient().post<{ message: string }>("/api/password-reset", {
        email: person.email,
      });
      expect(reply.status).toBe(202);
      expect(reply.body.message).toBe("If the address has an account, a reset link is on its way.");
    }
    await waitForMail({ to: person.email, subject: RESET_SUBJECT, skip: 2 });
    // Time for any further (wrongly sent) mail to arrive.
    await new Promise((resolve) => setTimeout(resolve, 1_500));
    expect(mailTo(person.email).filter((m) => RESET_SUBJECT.test(m.subject))).toHaveLength(3);
  });

  it("answer 429 to one address after 10 an hour, whatever addresses it asks for", async () => {
    const client = new ApiClient(testAddress());
    for (let request = 1; request <= 10; request++) {
      expect(
        (await client.post("/api/password-reset", { email: uniqueEmail("reset-spray") })).status,
      ).toBe(202);
    }
    const refused = await client.post<ErrorBody>("/api/password-reset", {
      email: uniqueEmail("reset-spray"),
    });
    expect(refused.status).toBe(429);
    expect(refused.body.error.code).toBe("rate_limited");
    expect(Number(refused.headers.get("retry-after"))).toBe(3600);
    // Another address is not affected.
    expect(
      (await new ApiClient().post("/api/password-reset", { email: uniqueEmail("reset-spray") }))
        .status,
    ).toBe(202);
  });
});

describe("sign-in's next", () => {
  it.each(["/%5Cevil.example/", "//evil.example/", "https://evil.example/", "/%09/evil.example"])(
    "the form never carries next=%s: it redirects home instead",
    async (next) => {
      const response = await fetch(`${APP_URL}/sign-in?next=${next}`);
      const html = await response.text();
      expect(response.status).toBe(200);
      const field = /<input[^>]*name="next"[^>]*>/.exec(html)?.[0];
      expect(field).toMatch(/value="\/"/);
    },
  );

  it("keeps a same-origin next", async () => {
    const html = await (await fetch(`${APP_URL}/sign-in?next=/notebooks%3Fstatus%3Ddraft`)).text();
    expect(/<input[^>]*name="next"[^>]*>/.exec(html)?.[0]).toContain(
      'value="/notebooks?status=draft"',
    );
  });
});
