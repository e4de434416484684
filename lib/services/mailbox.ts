// Who may read the local fake mailbox: lab leads always, everyone while developing.
import "server-only";
import { env } from "@/lib/env";
import { forbidden } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { can } from "@/lib/auth/policy";
import { readMailbox, type StoredMail } from "@/lib/mail/mailbox";

export function canReadMailbox(actor: Actor): boolean {
  return env().openMailbox || actor.memberships.some((m) => can(actor, "team.readMailbox", { teamId: m.teamId }));
}

export async function fetchMailbox(actor: Actor): Promise<StoredMail[]> {
  if (!canReadMailbox(actor)) throw forbidden("Only lab leads read the outgoing mail.");
  return readMailbox();
}
