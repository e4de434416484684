// Who may read the local fake mailbox, and which of its messages: everything while developing;
// otherwise a lab lead sees only mail to the members and invitees of the teams they lead.
import "server-only";
import { Op } from "sequelize";
import { env } from "@/lib/env";
import { forbidden } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { can } from "@/lib/auth/policy";
import { readMailbox, type StoredMail } from "@/lib/mail/mailbox";
import { Invitation, Membership, User } from "@/models";

function ledTeamIds(actor: Actor): string[] {
  return actor.memberships.filter((m) => can(actor, "team.readMailbox", { teamId: m.teamId })).map((m) => m.teamId);
}

export function canReadMailbox(actor: Actor): boolean {
  return env().openMailbox || ledTeamIds(actor).length > 0;
}

async function addressesOfTeams(teamIds: string[]): Promise<Set<string>> {
  const [members, invitations] = await Promise.all([
    Membership.findAll({ where: { teamId: { [Op.in]: teamIds } }, include: [{ model: User, as: "user", attributes: ["email"] }] }),
    Invitation.findAll({ where: { teamId: { [Op.in]: teamIds } }, attributes: ["email"] }),
  ]);
  return new Set(
    [...members.map((m) => (m.get("user") as User).email), ...invitations.map((i) => i.email)].map((e) => e.toLowerCase()),
  );
}

export async function fetchMailbox(actor: Actor): Promise<StoredMail[]> {
  if (!canReadMailbox(actor)) throw forbidden("Only lab leads read the outgoing mail.");
  const messages = await readMailbox();
  if (env().openMailbox) return messages;
  const addresses = await addressesOfTeams(ledTeamIds(actor));
  return messages.filter((m) => m.to.some((to) => addresses.has(to.toLowerCase())));
}
