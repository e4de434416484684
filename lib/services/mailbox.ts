// The outgoing-mail viewer over the local fake mailbox: off in production unless
// EMBERLINE_MAIL_VIEWER=1; everyone reads while developing, otherwise a lab lead reads only mail to
// the members and invitees of the teams they lead. Secret links are masked here, on the server,
// for everyone but a message's one recipient, so no reset or invitation link reaches another person.
import "server-only";
import { Op } from "sequelize";
import { env } from "@/lib/env";
import { forbidden, notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { can } from "@/lib/auth/policy";
import { readMailbox, type StoredMail } from "@/lib/mail/mailbox";
import { maskMailSecrets } from "@/lib/mail/mail-viewer";
import { Invitation, Membership, User } from "@/models";

function ledTeamIds(actor: Actor): string[] {
  return actor.memberships
    .filter((m) => can(actor, "team.readMailbox", { teamId: m.teamId }))
    .map((m) => m.teamId);
}

export function canReadMailbox(actor: Actor): boolean {
  const settings = env();
  return settings.mailViewer && (settings.openMailbox || ledTeamIds(actor).length > 0);
}

async function addressesOfTeams(teamIds: string[]): Promise<Set<string>> {
  const [members, invitations] = await Promise.all([
    Membership.findAll({
      where: { teamId: { [Op.in]: teamIds } },
      include: [{ model: User, as: "user", attributes: ["email"] }],
    }),
    Invitation.findAll({ where: { teamId: { [Op.in]: teamIds } }, attributes: ["email"] }),
  ]);
  return new Set(
    [...members.map((m) => (m.get("user") as User).email), ...invitations.map((i) => i.email)].map(
      (e) => e.toLowerCase(),
    ),
  );
}

/** Its own single recipient reads a message whole; everyone else with its secrets masked. */
function forReader(actor: Actor, message: StoredMail): StoredMail {
  const own = message.to.length === 1 && message.to[0].toLowerCase() === actor.email.toLowerCase();
  return own ? message : { ...message, text: maskMailSecrets(message.text) };
}

export async function fetchMailbox(actor: Actor): Promise<StoredMail[]> {
  if (!env().mailViewer) throw notFound("The outgoing-mail viewer is off on this installation.");
  if (!canReadMailbox(actor)) throw forbidden("Only lab leads read the outgoing mail.");
  const messages = await readMailbox();
  if (env().openMailbox) return messages.map((m) => forReader(actor, m));
  const addresses = await addressesOfTeams(ledTeamIds(actor));
  return messages
    .filter((m) => m.to.some((to) => addresses.has(to.toLowerCase())))
    .map((m) => forReader(actor, m));
}
