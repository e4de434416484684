// Personal access tokens: created once with their secret, used as Bearer, listed without it, revoked.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ApiClient, type ErrorBody } from "./support/http-client";
import {
  DEMO,
  FLAME_SCREENING,
  signInDemo,
  teamIdOf,
  uniqueEmail,
  type Me,
} from "./support/accounts";
import { closeDb, db } from "./support/database";

interface CreatedToken {
  id: string;
  name: string;
  prefix: string;
  token: string;
  createdAt: string;
  lastUsedAt: string | null;
}

let chemist: ApiClient;

beforeAll(async () => {
  chemist = await signInDemo("chemist");
});

afterAll(closeDb);

describe("access tokens", () => {
  it("go from creation to Bearer use to listing (without the secret) to revocation", async () => {
    const created = await chemist.post<CreatedToken>("/api/tokens", {
      name: "Instrument PC, bench 2",
    });
    expect(created.status).toBe(201);
    const { id, token, prefix } = created.body;
    expect(created.body.name).toBe("Instrument PC, bench 2");
    expect(token).toMatch(/^emb_[A-Za-z0-9_-]{40,}$/);
    expect(token.startsWith(prefix)).toBe(true);
    expect(prefix.length).toBeLessThan(token.length / 2);

    // A script with only the token, no cookie, acts as its owner.
    const script = new ApiClient();
    const me = await script.get<Me>("/api/me", { bearer: token });
    expect(me.status).toBe(200);
    expect(me.body.email).toBe(DEMO.chemist.email);
    expect(me.body.teams.map((t) => t.name)).toEqual([FLAME_SCREENING]);

    const listed = await chemist.get<CreatedToken[]>("/api/tokens");
    expect(listed.status).toBe(200);
    const entry = listed.body.find((t) => t.id === id);
    expect(entry).toMatchObject({ id, name: "Instrument PC, bench 2", prefix });
    expect(entry).not.toHaveProperty("token");
    // The secret appears nowhere in the listing, nor does its hash leave the server.
    const raw = JSON.stringify(listed.body);
    expect(raw).not.toContain(token);
    expect(raw).not.toMatch(/hash/i);
    // Its use was recorded.
    expect(entry!.lastUsedAt).not.toBeNull();

    // Only the hash is stored.
    const { rows } = await db().query("SELECT token_hash FROM access_tokens WHERE id = $1", [id]);
    expect(rows[0].token_hash).toMatch(/^[0-9a-f]{64}$/);
    expect(rows[0].token_hash).not.toContain(token);

    const revoked = await chemist.delete(`/api/tokens/${id}`);
    expect(revoked.status).toBe(204);
    const after = await script.get<ErrorBody>("/api/me", { bearer: token });
    expect(after.status).toBe(401);
    expect((await chemist.get<CreatedToken[]>("/api/tokens")).body.some((t) => t.id === id)).toBe(
      false,
    );
    // Revoking twice finds nothing.
    expect((await chemist.delete(`/api/tokens/${id}`)).status).toBe(404);
  });

  it("can be used by a Bearer client for a mutation, with no Origin check (no cookie, no CSRF)", async () => {
    const lead = await signInDemo("labLead");
    const { body } = await lead.post<CreatedToken>("/api/tokens", { name: "invite script" });
    const teamId = await teamIdOf(lead, FLAME_SCREENING);
    const reply = await new ApiClient().post(
      "/api/invitations",
      { teamId, email: uniqueEmail("by-token"), role: "chemist" },
      { bearer: body.token, headers: { origin: "https://elsewhere.example" } },
    );
    expect(reply.status).toBe(201);
    expect((await lead.delete(`/api/tokens/${body.id}`)).status).toBe(204);
  });

  it("are refused when unknown or malformed", async () => {
    const client = new ApiClient();
    expect(
      (await client.get("/api/me", { bearer: "emb_not-a-real-token-at-all-000000000000000000" }))
        .status,
    ).toBe(401);
    expect((await client.get("/api/me", { headers: { authorization: "Bearer " } })).status).toBe(
      401,
    );
  });

  it("cannot be revoked by another person, and a non-uuid id is simply not found", async () => {
    const { body } = await chemist.post<CreatedToken>("/api/tokens", { name: "not yours" });
    const supervisor = await signInDemo("supervisor");
    expect((await supervisor.delete(`/api/tokens/${body.id}`)).status).toBe(404);
    expect((await new ApiClient().get("/api/me", { bearer: body.token })).status).toBe(200);
    expect((await chemist.delete("/api/tokens/not-a-uuid")).status).toBe(404);
    expect((await chemist.delete(`/api/tokens/${body.id}`)).status).toBe(204);
  });
});
