// Server-side sessions: opened at sign-in, checked on every request, revoked at sign-out and when a
// password changes, so a copied cookie stops working.
import "server-only";
import { Op, type Transaction } from "sequelize";
import { UserSession } from "@/models";

export const SESSION_HOURS = 12;

export async function openSession(userId: string): Promise<string> {
  const row = await UserSession.create({
    userId,
    expiresAt: new Date(Date.now() + SESSION_HOURS * 3_600_000),
    revokedAt: null,
  });
  return row.id;
}

/**
 * The user behind a live session and when it was opened (removals from a team after that end the
 * session's access to the team), or null when it is unknown, revoked or expired.
 */
export async function liveSession(
  sessionId: string,
): Promise<{ userId: string; openedAt: Date } | null> {
  const row = await UserSession.findOne({
    where: { id: sessionId, revokedAt: null, expiresAt: { [Op.gt]: new Date() } },
    attributes: ["userId", "createdAt"],
  });
  return row ? { userId: row.userId, openedAt: row.createdAt } : null;
}

export async function revokeSession(sessionId: string): Promise<void> {
  await UserSession.update(
    { revokedAt: new Date() },
    { where: { id: sessionId, revokedAt: null } },
  );
}

/** Ends every session of a person, except optionally the one making the request; answers how many ended. */
export async function revokeSessionsOf(
  userId: string,
  options: { except?: string; transaction?: Transaction } = {},
): Promise<number> {
  const [ended] = await UserSession.update(
    { revokedAt: new Date() },
    {
      where: {
        userId,
        revokedAt: null,
        ...(options.except ? { id: { [Op.ne]: options.except } } : {}),
      },
      transaction: options.transaction,
    },
  );
  return ended;
}
