// An invitation end to end through the fake SMTP server: invite, read the mail, accept, sign in.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ApiClient, type ErrorBody } from "./support/http-client";
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
import { closeDb } from "./support/database";
import { OUTSIDER, ensureOutsider } from "./support/outsider";

let lead: ApiClient;
let flameTeamId: string;

beforeAll(async () => {
  lead = await signInDemo("labLead");
  flameTeamId = await teamIdOf(lead, FLAME_SCREENING);
});

afterAll(closeDb);

describe("invitations", () => {
  it("take a new person from the lab lead's invitation to a signed-in member with the invited role", async () => {
    const email = uniqueEmail("invitee");
    const invited = await lead.post<{ id: string }>("/api/invitations", {
      teamId: flameTeamId,
      email,
      role: "supervisor",
    });
    expect(invited.status).toBe(201);
    expect(invited.body.id).toMatch(/^[0-9a-f-]{36}$/);

    const mail = await waitForMail({
      to: email,
      subject: /^You are invited to Flame Screening on Emberline$/,
    });
    expect(mail.text).toContain(
      `${DEMO.labLead.name} invites you to join ${FLAME_SCREENING} as supervisor`,
    );
    const token = extractLinkToken(mail.text, "/invitations/");
    expect(token.length).toBeGreaterThanOrEqual(40);

    const newcomer = new ApiClient();
    const password = strongPassword();
    const accepted = await newcomer.post<{ userId: string }>("/api/invitations/accept", {
      token,
      name: "Nell Invitee",
      password,
    });
    expect(accepted.status).toBe(201);
    // Accepting signs the person in.
    const meNow = await newcomer.get<Me>("/api/me");
    expect(meNow.status).toBe(200);
    expect(meNow.body).toMatchObject({ id: accepted.body.userId, email, name: "Nell Invitee" });
    expect(meNow.body.teams).toEqual([
      { id: flameTeamId, name: FLAME_SCREENING, role: "supervisor" },
    ]);

    // And the new password works for a later sign-in.
    const later = await signedIn(email, password);
    expect((await later.get<Me>("/api/me")).body.teams[0].role).toBe("supervisor");

    // The link works once.
    const again = await new ApiClient().post<ErrorBody>("/api/invitations/accept", {
      token,
      name: "Someone Else",
      password: strongPassword(),
    });
    expect(again.status).toBe(400);
    expect(again.body.error.message).toMatch(/not valid any more/);
  });

  it("normalise the address, and refuse to invite someone already in the team", async () => {
    const reply = await lead.post<ErrorBody>("/api/invitations", {
      teamId: flameTeamId,
      email: DEMO.chemist.email.toUpperCase(),
      role: "chemist",
    });
    expect(reply.status).toBe(409);
    expect(reply.body.error.fieldErrors?.email).toEqual(["Already a member of this team."]);
    expect(mailTo(DEMO.chemist.email).filter((m) => /invited/.test(m.subject))).toEqual([]);
  });

  it("ask a new person for a name and an acceptable password before creating the account", async () => {
    const email = uniqueEmail("fussy");
    expect(
      (await lead.post("/api/invitations", { teamId: flameTeamId, email, role: "chemist" })).status,
    ).toBe(201);
    const token = extractLinkToken(
      (await waitForMail({ to: email, subject: /invited/ })).text,
      "/invitations/",
    );
    const client = new ApiClient();

    const noName = await client.post<ErrorBody>("/api/invitations/accept", {
      token,
      password: strongPassword(),
    });
    expect(noName.status).toBe(400);
    expect(noName.body.error.fieldErrors?.name).toEqual(["Enter your name."]);

    const short = await client.post<ErrorBody>("/api/invitations/accept", {
      token,
      name: "Fen",
      password: "short",
    });
    expect(short.status).toBe(400);
    expect(short.body.error.fieldErrors?.password?.[0]).toMatch(/at least 12 characters/);

    const ownAddress = await client.post<ErrorBody>("/api/invitations/accept", {
      token,
      name: "Fen",
      password: email,
    });
    expect(ownAddress.status).toBe(400);
    expect(ownAddress.body.error.fieldErrors?.password).toContain(
      "The password must not be your e-mail address.",
    );

    // None of those used up the invitation.
    expect(
      (
        await client.post("/api/invitations/accept", {
          token,
          name: "Fen",
          password: strongPassword(),
        })
      ).status,
    ).toBe(201);
  });

  it("let a person who already has an account join another team with their existing password", async () => {
    const person = await createAccountThroughInvitation(lead, { label: "two-teams" });
    const outsiderTeam = await ensureOutsider();
    const outsiderLead = await signedIn(OUTSIDER.email, OUTSIDER.password);
    const invited = await outsiderLead.post("/api/invitations", {
      teamId: outsiderTeam.teamId,
      email: person.email,
      role: "lab_lead",
    });
    expect(invited.status).toBe(201);
    const mail = await waitForMail({ to: person.email, subject: /invited to Outsider Test Bench/ });
    const token = extractLinkToken(mail.text, "/invitations/");

    const wrong = await new ApiClient().post<ErrorBody>("/api/invitations/accept", {
      token,
      password: strongPassword(),
    });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fieldErrors?.password).toEqual([
      "The password is not right for this account.",
    ]);

    const client = new ApiClient();
    const accepted = await client.post<{ userId: string }>("/api/invitations/accept", {
      token,
      password: person.password,
    });
    expect(accepted.status).toBe(201);
    expect(accepted.body.userId).toBe(person.userId);
    const me = await client.get<Me>("/api/me");
    expect(me.body.name).toBe(person.name);
    expect(me.body.teams.map((t) => [t.name, t.role])).toEqual([
      [FLAME_SCREENING, "chemist"],
      [OUTSIDER.teamName, "lab_lead"],
    ]);
  });
});
