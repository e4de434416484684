// Team management through the HTTP API: the member list, role changes and removals by lab leads
// (audited, e-mailed, effective on the member's next request, sessions and tokens of a removed member
// refused with 401 for that team only), the rule that a team keeps a lab lead (in the service and in
// the database), and resending and revoking invitations.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { APP_URL, ApiClient, type ApiReply, type ErrorBody } from "./support/http-client";
import {
  DEMO,
  FLAME_SCREENING,
  createAccountThroughInvitation,
  signInDemo,
  signedIn,
  strongPassword,
  teamIdOf,
  uniqueEmail,
  type Me,
} from "./support/accounts";
import { extractLinkToken, mailTo, waitForMail } from "./support/mailbox";
import { appDb, auditEventsSince, auditMark, closeDb, db, userIdByEmail } from "./support/database";
import { OUTSIDER, ensureOutsider } from "./support/outsider";
import { joinWithExistingAccount, scratchTeam } from "./support/scratch-team";

interface Member {
  userId: string;
  name: string;
  email: string;
  role: "chemist" | "supervisor" | "lab_lead";
  joinedAt: string;
}

interface Pending {
  id: string;
  email: string;
  role: string;
  invitedByName: string;
  sentAt: string;
  expiresAt: string;
  expired: boolean;
}

/** A well-formed user id that is no member of any team. */
const NO_MEMBER_ID = "00000000-0000-4000-8000-000000000000";

let lead: ApiClient;
let chemist: ApiClient;
let flameTeamId: string;
let leadId: string;

beforeAll(async () => {
  lead = await signInDemo("labLead");
  chemist = await signInDemo("chemist");
  flameTeamId = await teamIdOf(lead, FLAME_SCREENING);
  leadId = await userIdByEmail(DEMO.labLead.email);
});

afterAll(closeDb);

function patchRole(client: ApiClient, teamId: string, userId: string, role: string) {
  return client.request<Member & ErrorBody>("PATCH", `/api/teams/${teamId}/members/${userId}`, {
    json: { role },
  });
}

function removeMember(client: ApiClient, teamId: string, userId: string) {
  return client.delete<ErrorBody>(`/api/teams/${teamId}/members/${userId}`);
}

async function roleInDb(teamId: string, userId: string): Promise<string | null> {
  const { rows } = await db().query<{ role: string }>(
    "SELECT role FROM memberships WHERE team_id = $1 AND user_id = $2",
    [teamId, userId],
  );
  return rows[0]?.role ?? null;
}

async function leadCount(teamId: string): Promise<number> {
  const { rows } = await db().query<{ n: number }>(
    "SELECT count(*)::int AS n FROM memberships WHERE team_id = $1 AND role = 'lab_lead'",
    [teamId],
  );
  return rows[0].n;
}

describe("the member list", () => {
  it("shows every member of the team their fellow members with role and joining date", async () => {
    const reply = await chemist.get<Member[]>(`/api/teams/${flameTeamId}/members`);
    expect(reply.status).toBe(200);
    const byEmail = new Map(reply.body.map((m) => [m.email, m]));
    expect(byEmail.get(DEMO.labLead.email)).toMatchObject({
      name: DEMO.labLead.name,
      role: "lab_lead",
    });
    expect(byEmail.get(DEMO.supervisor.email)?.role).toBe("supervisor");
    expect(byEmail.get(DEMO.chemist.email)?.role).toBe("chemist");
    for (const member of reply.body) expect(Number.isNaN(Date.parse(member.joinedAt))).toBe(false);
  });

  it("is not found for another team's member and asks the anonymous to sign in", async () => {
    await ensureOutsider();
    const outsider = await signedIn(OUTSIDER.email, OUTSIDER.password);
    expect((await outsider.get(`/api/teams/${flameTeamId}/members`)).status).toBe(404);
    expect((await new ApiClient().get(`/api/teams/${flameTeamId}/members`)).status).toBe(401);
  });
});

describe("changing a member's role", () => {
  it("applies on the member's next request, is audited with actor, team and target, and is e-mailed", async () => {
    const person = await createAccountThroughInvitation(lead, { label: "promoted" });
    const session = await signedIn(person.email, person.password);
    const invitationsPath = `/api/teams/${flameTeamId}/invitations`;
    expect((await session.get(invitationsPath)).status).toBe(403);

    const mark = await auditMark();
    const reply = await patchRole(lead, flameTeamId, person.userId, "lab_lead");
    expect(reply.status, JSON.stringify(reply.body)).toBe(200);
    expect(reply.body).toMatchObject({ userId: person.userId, role: "lab_lead" });

    // The same session, no new sign-in: the role is read on every request.
    expect((await session.get<Me>("/api/me")).body.teams).toEqual([
      { id: flameTeamId, name: FLAME_SCREENING, role: "lab_lead" },
    ]);
    expect((await session.get(invitationsPath)).status).toBe(200);

    const events = await auditEventsSince(mark, { action: "membership.update" });
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({
      actor_id: leadId,
      team_id: flameTeamId,
      entity: "membership",
      before: { userId: person.userId, email: person.email, role: "chemist" },
      after: { userId: person.userId, email: person.email, role: "lab_lead" },
    });
    const mail = await waitForMail({ to: person.email, subject: /role in Flame Screening/ });
    expect(mail.subject).toBe("Your role in Flame Screening is now lab lead");
    expect(mail.text).toContain(
      `${DEMO.labLead.name} changed your role in ${FLAME_SCREENING} from chemist to lab lead.`,
    );

    // Back down again: a lab lead demoted loses the lead's routes on the next request.
    expect((await patchRole(lead, flameTeamId, person.userId, "chemist")).status).toBe(200);
    expect((await session.get(invitationsPath)).status).toBe(403);
  });

  it("writes nothing and mails nothing when the role is the one the member has", async () => {
    const person = await createAccountThroughInvitation(lead, { label: "same-role" });
    const mark = await auditMark();
    const reply = await patchRole(lead, flameTeamId, person.userId, "chemist");
    expect(reply.status).toBe(200);
    expect(reply.body.role).toBe("chemist");
    expect(await auditEventsSince(mark)).toEqual([]);
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(mailTo(person.email).filter((m) => /role in/.test(m.subject))).toEqual([]);
  });

  it("is refused to members who are not lab leads (403), outsiders (404) and bad roles (400)", async () => {
    const person = await createAccountThroughInvitation(lead, { label: "not-by-chemist" });
    const supervisor = await signInDemo("supervisor");
    const mark = await auditMark();
    expect((await patchRole(chemist, flameTeamId, person.userId, "lab_lead")).status).toBe(403);
    expect((await patchRole(supervisor, flameTeamId, person.userId, "lab_lead")).status).toBe(403);
    expect((await removeMember(chemist, flameTeamId, person.userId)).status).toBe(403);
    await ensureOutsider();
    const outsider = await signedIn(OUTSIDER.email, OUTSIDER.password);
    expect((await patchRole(outsider, flameTeamId, person.userId, "lab_lead")).status).toBe(404);
    expect((await removeMember(outsider, flameTeamId, person.userId)).status).toBe(404);

    const bad = await patchRole(lead, flameTeamId, person.userId, "admin");
    expect(bad.status).toBe(400);
    expect(bad.body.error.fieldErrors?.role).toEqual([
      "Choose a role: chemist, supervisor or lab lead.",
    ]);
    const notMember = await patchRole(lead, flameTeamId, NO_MEMBER_ID, "chemist");
    expect(notMember.status).toBe(404);

    expect(await roleInDb(flameTeamId, person.userId)).toBe("chemist");
    // Only the outsider's sign-in (an event of no team) was written meanwhile.
    expect((await auditEventsSince(mark)).filter((e) => e.team_id !== null)).toEqual([]);
  });
});

describe("a team always keeps a lab lead", () => {
  it("refuses the only lab lead's demotion and removal with a sentence, and allows them once another leads", async () => {
    const { teamId, name, founder } = await scratchTeam(lead);
    const founderClient = await signedIn(founder.email, founder.password);
    const mark = await auditMark();

    const demote = await patchRole(founderClient, teamId, founder.userId, "supervisor");
    expect(demote.status).toBe(409);
    expect(demote.body.error.message).toBe(
      `You are the only lab lead of ${name}, so your role cannot change: a team always keeps at least one lab lead. Make another member lab lead first.`,
    );
    expect(demote.body.error.fieldErrors?.role).toEqual(["The team's only lab lead."]);
    const leave = await removeMember(founderClient, teamId, founder.userId);
    expect(leave.status).toBe(409);
    expect(leave.body.error.message).toMatch(
      new RegExp(`^You are the only lab lead of ${name}, so you cannot be removed`),
    );
    expect(await roleInDb(teamId, founder.userId)).toBe("lab_lead");
    expect(await auditEventsSince(mark)).toEqual([]);

    // Another member made lab lead: now the founder may step down, and the other may not.
    const second = await createAccountThroughInvitation(lead, { label: "second-lead" });
    await joinWithExistingAccount(founderClient, teamId, name, second);
    expect((await patchRole(founderClient, teamId, second.userId, "lab_lead")).status).toBe(200);
    expect((await patchRole(founderClient, teamId, founder.userId, "chemist")).status).toBe(200);
    const secondClient = await signedIn(second.email, second.password);
    const alone = await removeMember(secondClient, teamId, second.userId);
    expect(alone.status).toBe(409);
    expect(await leadCount(teamId)).toBe(1);

    // The demoted founder is no lab lead any more: their next change is refused.
    expect((await patchRole(founderClient, teamId, founder.userId, "lab_lead")).status).toBe(403);
  });

  it("keeps one of two lab leads who demote each other at the same moment", async () => {
    const { teamId, name, founder } = await scratchTeam(lead);
    const founderClient = await signedIn(founder.email, founder.password);
    const other = await createAccountThroughInvitation(lead, { label: "rival-lead" });
    await joinWithExistingAccount(founderClient, teamId, name, other, "lab_lead");
    const otherClient = await signedIn(other.email, other.password);
    expect(await leadCount(teamId)).toBe(2);

    const replies: ApiReply<ErrorBody>[] = await Promise.all([
      patchRole(founderClient, teamId, other.userId, "chemist"),
      patchRole(otherClient, teamId, founder.userId, "chemist"),
    ]);
    // One wins; the other, serialised behind it on the team's row, finds its own author demoted.
    expect(replies.map((r) => r.status).sort()).toEqual([200, 403]);
    expect(await leadCount(teamId)).toBe(1);
  });

  it("is guarded by the database too: the app's role cannot demote or delete a team's last lab lead", async () => {
    const { teamId, founder } = await scratchTeam(lead);
    const plain = await createAccountThroughInvitation(lead, { label: "db-guard" });
    await db().query(
      "INSERT INTO memberships (user_id, team_id, role) VALUES ($1, $2, 'chemist')",
      [plain.userId, teamId],
    );
    await expect(
      appDb().query("UPDATE memberships SET role = 'chemist' WHERE team_id = $1 AND user_id = $2", [
        teamId,
        founder.userId,
      ]),
    ).rejects.toThrow(/keeps at least one lab lead/);
    await expect(
      appDb().query("DELETE FROM memberships WHERE team_id = $1 AND user_id = $2", [
        teamId,
        founder.userId,
      ]),
    ).rejects.toThrow(/keeps at least one lab lead/);
    expect(await roleInDb(teamId, founder.userId)).toBe("lab_lead");
    // A chemist leaving is no concern of the guard.
    await appDb().query("DELETE FROM memberships WHERE team_id = $1 AND user_id = $2", [
      teamId,
      plain.userId,
    ]);
    expect(await roleInDb(teamId, plain.userId)).toBeNull();
  });
});

describe("removing a member through the API", () => {
  it("ends their session's and token's access to that team at once (401), leaves their other team, is audited and e-mailed", async () => {
    const { teamId: otherTeamId, name: otherTeamName, founder } = await scratchTeam(lead);
    const person = await createAccountThroughInvitation(lead, { label: "removed-api" });
    await joinWithExistingAccount(
      await signedIn(founder.email, founder.password),
      otherTeamId,
      otherTeamName,
      person,
    );
    const session = await signedIn(person.email, person.password);
    const { body: created } = await session.post<{ token: string }>("/api/tokens", {
      name: "bench script",
    });
    const flamePath = `/api/notebooks?teamId=${flameTeamId}`;
    const otherPath = `/api/notebooks?teamId=${otherTeamId}`;
    expect((await session.get(flamePath)).status).toBe(200);
    expect((await new ApiClient().get(flamePath, { bearer: created.token })).status).toBe(200);

    const mark = await auditMark();
    const removed = await removeMember(lead, flameTeamId, person.userId);
    expect(removed.status, JSON.stringify(removed.body)).toBe(204);

    const bySession = await session.get<ErrorBody>(flamePath);
    expect(bySession.status).toBe(401);
    expect(bySession.body.error.message).toMatch(/^A lab lead removed you from this team/);
    const byToken = await new ApiClient().get<ErrorBody>(flamePath, { bearer: created.token });
    expect(byToken.status).toBe(401);
    // One record of the team by id, too (not only lists).
    const { rows: notebooks } = await db().query<{ id: string }>(
      "SELECT id FROM notebooks WHERE team_id = $1 LIMIT 1",
      [flameTeamId],
    );
    expect((await session.get(`/api/notebooks/${notebooks[0].id}`)).status).toBe(401);

    // The other team still opens, with the same session and token.
    expect((await session.get(otherPath)).status).toBe(200);
    expect((await new ApiClient().get(otherPath, { bearer: created.token })).status).toBe(200);
    expect((await session.get<Me>("/api/me")).body.teams.map((t) => t.id)).toEqual([otherTeamId]);
    // A session opened after the removal never had the team: it is an outsider's 404.
    const fresh = await signedIn(person.email, person.password);
    expect((await fresh.get(flamePath)).status).toBe(404);

    const events = await auditEventsSince(mark, { action: "membership.delete" });
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({
      actor_id: leadId,
      team_id: flameTeamId,
      entity: "membership",
      before: { userId: person.userId, email: person.email, role: "chemist" },
      after: null,
    });
    const { rows: removals } = await db().query(
      "SELECT team_id, role, removed_by_id FROM membership_removals WHERE user_id = $1",
      [person.userId],
    );
    expect(removals).toEqual([{ team_id: flameTeamId, role: "chemist", removed_by_id: leadId }]);
    const mail = await waitForMail({ to: person.email, subject: /removed from Flame Screening/ });
    expect(mail.text).toContain(`${DEMO.labLead.name} removed you from ${FLAME_SCREENING}.`);

    // Removing again finds no such member.
    expect((await removeMember(lead, flameTeamId, person.userId)).status).toBe(404);
  });

  it("gives the team back to old sessions when the person is invited and joins again", async () => {
    const person = await createAccountThroughInvitation(lead, { label: "rejoins" });
    const session = await signedIn(person.email, person.password);
    const path = `/api/notebooks?teamId=${flameTeamId}`;
    expect((await removeMember(lead, flameTeamId, person.userId)).status).toBe(204);
    expect((await session.get(path)).status).toBe(401);
    await joinWithExistingAccount(lead, flameTeamId, FLAME_SCREENING, person);
    expect((await session.get(path)).status).toBe(200);
  });
});

describe("resending and revoking invitations", () => {
  async function invite(label: string): Promise<{ email: string; id: string; token: string }> {
    const email = uniqueEmail(label);
    const created = await lead.post<{ id: string }>("/api/invitations", {
      teamId: flameTeamId,
      email,
      role: "supervisor",
    });
    expect(created.status).toBe(201);
    const mail = await waitForMail({ to: email, subject: /invited to Flame Screening/ });
    return { email, id: created.body.id, token: extractLinkToken(mail.text, "/invitations/") };
  }

  async function pendingList(): Promise<Pending[]> {
    const reply = await lead.get<Pending[]>(`/api/teams/${flameTeamId}/invitations`);
    expect(reply.status).toBe(200);
    return reply.body;
  }

  async function invitationPageText(token: string): Promise<string> {
    const reply = await fetch(`${APP_URL}/invitations/${token}`);
    return (await reply.text()).replace(/<[^>]+>/g, " ").replace(/&#x27;|&#39;/g, "'");
  }

  it("resend mails a fresh link and the earlier one stops working; audited", async () => {
    const { email, id, token: first } = await invite("resend");
    expect((await pendingList()).find((p) => p.id === id)).toMatchObject({
      email,
      role: "supervisor",
      invitedByName: DEMO.labLead.name,
      expired: false,
    });

    const mark = await auditMark();
    const resent = await lead.post<Pending>(`/api/invitations/${id}/resend`);
    expect(resent.status, JSON.stringify(resent.body)).toBe(200);
    expect(resent.body).toMatchObject({ id, email, expired: false });
    const mail = await waitForMail({ to: email, subject: /invited to Flame Screening/, skip: 1 });
    expect(mail.text).toContain("the link in the earlier message no longer works");
    const second = extractLinkToken(mail.text, "/invitations/");
    expect(second).not.toBe(first);

    const stale = await new ApiClient().post<ErrorBody>("/api/invitations/accept", {
      token: first,
      name: "Old Link",
      password: strongPassword(),
    });
    expect(stale.status).toBe(400);
    expect(stale.body.error.message).toMatch(
      /^This invitation is not valid any more\. If it was sent to you again, use the link in the newest message/,
    );
    expect(await invitationPageText(first)).toContain("use the link in the newest message");

    const events = await auditEventsSince(mark, { action: "invitation.resend" });
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({ actor_id: leadId, team_id: flameTeamId, entity_id: id });

    const joined = await new ApiClient().post("/api/invitations/accept", {
      token: second,
      name: "New Link",
      password: strongPassword(),
    });
    expect(joined.status).toBe(201);
    expect((await pendingList()).some((p) => p.id === id)).toBe(false);
    // An accepted invitation can be neither resent nor revoked.
    const late = await lead.delete<ErrorBody>(`/api/invitations/${id}`);
    expect(late.status).toBe(409);
    expect(late.body.error.message).toMatch(/already accepted this invitation/);
  });

  it("revoke makes the link refuse with a sentence, tells the invitee, and is audited", async () => {
    const { email, id, token } = await invite("revoke");
    const mark = await auditMark();
    expect((await chemist.delete(`/api/invitations/${id}`)).status).toBe(403);
    expect((await chemist.post(`/api/invitations/${id}/resend`)).status).toBe(403);

    const revoked = await lead.delete(`/api/invitations/${id}`);
    expect(revoked.status).toBe(204);
    const refused = await new ApiClient().post<ErrorBody>("/api/invitations/accept", {
      token,
      name: "Too Late",
      password: strongPassword(),
    });
    expect(refused.status).toBe(400);
    expect(refused.body.error.message).toBe(
      `This invitation is not valid any more: a lab lead of ${FLAME_SCREENING} revoked it. Ask them for a new one if you should still join.`,
    );
    expect(await invitationPageText(token)).toContain(
      `a lab lead of ${FLAME_SCREENING} revoked it`,
    );
    const mail = await waitForMail({
      to: email,
      subject: /invitation to Flame Screening was revoked/,
    });
    expect(mail.text).toContain(`${DEMO.labLead.name} revoked the invitation`);
    expect((await pendingList()).some((p) => p.id === id)).toBe(false);

    const events = await auditEventsSince(mark, { action: "invitation.revoke" });
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({
      actor_id: leadId,
      team_id: flameTeamId,
      entity: "invitation",
      entity_id: id,
      before: { email, role: "supervisor" },
    });
    expect((await auditEventsSince(mark)).map((e) => e.action)).toEqual(["invitation.revoke"]);

    const again = await lead.delete<ErrorBody>(`/api/invitations/${id}`);
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/was already revoked/);
    expect((await lead.post(`/api/invitations/${id}/resend`)).status).toBe(409);
  });

  it("lists an expired invitation as expired, and a resend renews it", async () => {
    const { id, email } = await invite("expired");
    await db().query("UPDATE invitations SET expires_at = now() - interval '1 day' WHERE id = $1", [
      id,
    ]);
    expect((await pendingList()).find((p) => p.id === id)?.expired).toBe(true);
    const resent = await lead.post<Pending>(`/api/invitations/${id}/resend`);
    expect(resent.status).toBe(200);
    expect(resent.body.expired).toBe(false);
    expect(Date.parse(resent.body.expiresAt)).toBeGreaterThan(Date.now() + 6 * 86_400_000);
    const mail = await waitForMail({ to: email, subject: /invited/, skip: 1 });
    const accepted = await new ApiClient().post("/api/invitations/accept", {
      token: extractLinkToken(mail.text, "/invitations/"),
      name: "Late Joiner",
      password: strongPassword(),
    });
    expect(accepted.status).toBe(201);
  });
});
