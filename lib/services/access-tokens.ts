// Personal access tokens: created once (the secret is shown only then), listed, revoked.
import "server-only";
import { AppError, notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize } from "@/lib/auth/policy";
import { hashToken, newSecretToken } from "@/lib/auth/secret-token";
import { AccessToken, sequelize } from "@/models";
import { recordAudit } from "./audit";

export const TOKEN_PREFIX = "emb_";
const MAX_ACTIVE_TOKENS = 20;

export interface AccessTokenSummary {
  id: string;
  name: string;
  prefix: string;
  createdAt: string;
  lastUsedAt: string | null;
}

function summarise(row: AccessToken): AccessTokenSummary {
  return {
    id: row.id,
    name: row.name,
    prefix: row.tokenPrefix,
    createdAt: row.createdAt.toISOString(),
    lastUsedAt: row.lastUsedAt?.toISOString() ?? null,
  };
}

export async function createAccessToken(
  actor: Actor,
  input: { name: string },
): Promise<AccessTokenSummary & { token: string }> {
  authorize(actor, "self.manageTokens", { userId: actor.id });
  const active = await AccessToken.count({ where: { userId: actor.id, revokedAt: null } });
  if (active >= MAX_ACTIVE_TOKENS) {
    throw new AppError(
      "conflict",
      `You already have ${MAX_ACTIVE_TOKENS} active tokens; revoke one first.`,
    );
  }
  const token = newSecretToken(TOKEN_PREFIX);
  const row = await sequelize.transaction(async (transaction) => {
    const created = await AccessToken.create(
      {
        userId: actor.id,
        name: input.name,
        tokenHash: hashToken(token),
        tokenPrefix: token.slice(0, TOKEN_PREFIX.length + 6),
        lastUsedAt: null,
        revokedAt: null,
      },
      { transaction },
    );
    await recordAudit(
      {
        actorId: actor.id,
        action: "token.create",
        entity: "access_token",
        entityId: created.id,
        after: { name: input.name },
      },
      transaction,
    );
    return created;
  });
  return { ...summarise(row), token };
}

export async function fetchAccessTokens(actor: Actor): Promise<AccessTokenSummary[]> {
  authorize(actor, "self.manageTokens", { userId: actor.id });
  const rows = await AccessToken.findAll({
    where: { userId: actor.id, revokedAt: null },
    order: [["createdAt", "DESC"]],
  });
  return rows.map(summarise);
}

export async function revokeAccessToken(actor: Actor, tokenId: string): Promise<void> {
  authorize(actor, "self.manageTokens", { userId: actor.id });
  await sequelize.transaction(async (transaction) => {
    const row = await AccessToken.findOne({
      where: { id: tokenId, userId: actor.id, revokedAt: null },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    if (!row) throw notFound("No such token.");
    await row.update({ revokedAt: new Date() }, { transaction });
    await recordAudit(
      {
        actorId: actor.id,
        action: "token.revoke",
        entity: "access_token",
        entityId: row.id,
        before: { name: row.name },
      },
      transaction,
    );
  });
}
