// The demo accounts from db/seed.ts and ways to get signed-in clients and fresh accounts.
import { randomBytes } from "node:crypto";
import { expect } from "vitest";
import { ApiClient, testAddress } from "./http-client";
import { extractLinkToken, waitForMail } from "./mailbox";

export const DEMO_PASSWORD = "emberline-demo";
export const FLAME_SCREENING = "Flame Screening";
export const ARC_AND_SPARK = "Arc and Spark Bench";

export const DEMO = {
  chemist: { email: "chem@demo.emberline.example", name: "Mara Quist" },
  supervisor: { email: "super@demo.emberline.example", name: "Tobias Wren" },
  labLead: { email: "lead@demo.emberline.example", name: "Ilse Varga" },
} as const;

export type DemoRole = keyof typeof DEMO;

export interface Me {
  id: string;
  email: string;
  name: string;
  teams: { id: string; name: string; role: "chemist" | "supervisor" | "lab_lead" }[];
}

/** A client signed in with e-mail and password; fails the test when sign-in does not succeed. */
export async function signedIn(
  email: string,
  password: string,
  address = testAddress(),
): Promise<ApiClient> {
  const client = new ApiClient(address);
  const reply = await client.post<Me>("/api/session", { email, password });
  expect(reply.status, `sign-in of ${email}: ${JSON.stringify(reply.body)}`).toBe(200);
  return client;
}

export function signInDemo(role: DemoRole, address?: string): Promise<ApiClient> {
  return signedIn(DEMO[role].email, DEMO_PASSWORD, address);
}

/** A unique address under a domain reserved for tests, so that no real mailbox is ever involved. */
export function uniqueEmail(label: string): string {
  return `${label}-${Date.now().toString(36)}-${randomBytes(3).toString("hex")}@test.emberline.example`;
}

export function strongPassword(): string {
  return `ember ${randomBytes(6).toString("hex")} flame`;
}

/** The id of a team the demo lab lead sees, by name. */
export async function teamIdOf(client: ApiClient, teamName: string): Promise<string> {
  const me = await client.get<Me>("/api/me");
  const team = me.body.teams.find((t) => t.name === teamName);
  if (!team) throw new Error(`The signed-in person is not in ${teamName}`);
  return team.id;
}

export interface FreshAccount {
  email: string;
  password: string;
  name: string;
  userId: string;
}

/**
 * A new person created through the real flow: the demo lab lead invites them into Flame
 * Screening, the invitation mail arrives, and the link's token is accepted.
 */
export async function createAccountThroughInvitation(
  lead: ApiClient,
  options: { label?: string; role?: "chemist" | "supervisor" | "lab_lead" } = {},
): Promise<FreshAccount> {
  const email = uniqueEmail(options.label ?? "person");
  const teamId = await teamIdOf(lead, FLAME_SCREENING);
  const invited = await lead.post("/api/invitations", {
    teamId,
    email,
    role: options.role ?? "chemist",
  });
  expect(invited.status, JSON.stringify(invited.body)).toBe(201);
  const mail = await waitForMail({ to: email, subject: /invited to Flame Screening/ });
  const token = extractLinkToken(mail.text, "/invitations/");
  const password = strongPassword();
  const name = `Test Person ${randomBytes(2).toString("hex")}`;
  const accepted = await new ApiClient().post<{ userId: string }>("/api/invitations/accept", {
    token,
    name,
    password,
  });
  expect(accepted.status, JSON.stringify(accepted.body)).toBe(201);
  return { email, password, name, userId: accepted.body.userId };
}
