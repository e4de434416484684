// Writes and reads the append-only audit trail. Every mutation in every service calls recordAudit
// inside the same transaction as the change it describes.
import "server-only";
import type { Transaction } from "sequelize";
import { AuditEvent, User } from "@/models";
import type { Actor } from "@/lib/auth/actor";
import { authorize } from "@/lib/auth/policy";

export interface AuditInput {
  actorId: string | null;
  teamId?: string | null;
  action: string;
  entity: string;
  entityId?: string | null;
  before?: unknown;
  after?: unknown;
  reason?: string | null;
}

export async function recordAudit(input: AuditInput, transaction?: Transaction): Promise<void> {
  await AuditEvent.create(
    {
      actorId: input.actorId,
      teamId: input.teamId ?? null,
      action: input.action,
      entity: input.entity,
      entityId: input.entityId ?? null,
      before: input.before ?? null,
      after: input.after ?? null,
      reason: input.reason ?? null,
    },
    { transaction },
  );
}

export interface AuditEntry {
  id: string;
  at: string;
  actorName: string | null;
  action: string;
  entity: string;
  entityId: string | null;
  reason: string | null;
}

export async function fetchRecentActivity(actor: Actor, teamId: string, limit = 15): Promise<AuditEntry[]> {
  authorize(actor, "audit.view", { teamId });
  const rows = await AuditEvent.findAll({
    where: { teamId },
    order: [["id", "DESC"]],
    limit,
    include: [{ model: User, as: "actor", attributes: ["name"] }],
  });
  return rows.map((row) => ({
    id: String(row.id),
    at: row.createdAt.toISOString(),
    actorName: (row.get("actor") as User | null)?.name ?? null,
    action: row.action,
    entity: row.entity,
    entityId: row.entityId,
    reason: row.reason,
  }));
}
