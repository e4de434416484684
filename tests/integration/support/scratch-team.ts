// A team of a test's own for the lab-lead rules, so the demo team's lab lead is never at stake (other
// tests invite more lab leads into Flame Screening, so "the only lab lead" cannot be the demo one):
// a fresh person, who joined Flame Screening as a chemist through an invitation, made its only lab
// lead. The app has no way to create a team, hence the direct insert (as in outsider.ts).
import { randomBytes } from "node:crypto";
import { expect } from "vitest";
import { ApiClient } from "./http-client";
import { createAccountThroughInvitation, type FreshAccount } from "./accounts";
import { db } from "./database";
import { extractLinkToken, mailTo, waitForMail } from "./mailbox";

export interface ScratchTeam {
  teamId: string;
  name: string;
  /** Its only lab lead. */
  founder: FreshAccount;
}

export async function scratchTeam(demoLead: ApiClient): Promise<ScratchTeam> {
  const founder = await createAccountThroughInvitation(demoLead, { label: "scratch-lead" });
  const name = `Team Test Bench ${randomBytes(3).toString("hex")}`;
  const { rows } = await db().query<{ id: string }>(
    "INSERT INTO teams (name) VALUES ($1) RETURNING id",
    [name],
  );
  await db().query("INSERT INTO memberships (user_id, team_id, role) VALUES ($1, $2, 'lab_lead')", [
    founder.userId,
    rows[0].id,
  ]);
  return { teamId: rows[0].id, name, founder };
}

/** Invites an existing account into a team through the API and accepts with its password. */
export async function joinWithExistingAccount(
  inviter: ApiClient,
  teamId: string,
  teamName: string,
  person: FreshAccount,
  role: "chemist" | "supervisor" | "lab_lead" = "chemist",
): Promise<void> {
  const skip = mailTo(person.email).filter((m) => m.subject.includes(teamName)).length;
  const invited = await inviter.post("/api/invitations", { teamId, email: person.email, role });
  expect(invited.status, JSON.stringify(invited.body)).toBe(201);
  const mail = await waitForMail({ to: person.email, subject: new RegExp(teamName), skip });
  const accepted = await new ApiClient().post("/api/invitations/accept", {
    token: extractLinkToken(mail.text, "/invitations/"),
    password: person.password,
  });
  expect(accepted.status, JSON.stringify(accepted.body)).toBe(201);
}
