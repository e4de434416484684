// Verifies the audit trail's hash chains (migration 0009): every team's events in sequence, each
// link recomputed in TypeScript from the stored fields, and every sign-off's bound content hash
// compared with the signature row and with the run's content recomputed from the tables now. Reads
// one consistent snapshot; used by `npm run audit:verify` and GET /api/audit/verify (lab leads).
import "server-only";
import { QueryTypes, Transaction } from "sequelize";
import { sequelize } from "@/models";
import type { Actor } from "@/lib/auth/actor";
import { authorize } from "@/lib/auth/policy";
import {
  chainedAuditEventOf,
  checkChainLink,
  type AuditChainRow,
  type ChainBreak,
  type ChainHead,
} from "@/lib/audit/audit-chain";
import { recomputeRunContentHash } from "./run-signed-content";

/** What the verification found for one team's chain (teamId null: events that belong to no team). */
export interface AuditChainReport {
  teamId: string | null;
  ok: boolean;
  /** Events checked (up to the break, when there is one). */
  checked: number;
  /** The last good link: record it outside the database to notice a rewritten or shortened chain later. */
  head: ChainHead | null;
  /** The first broken link, when the chain is broken. */
  break: (Omit<ChainBreak, "problem"> & { problem: ChainBreak["problem"] | "signature" }) | null;
}

interface ChainRow extends AuditChainRow {
  signed_hash: string | null;
}

const BATCH = 1000;

/** A sign-off must bind the hash its signature row holds, and the run must still have that content. */
async function checkSignature(row: ChainRow, sequence: number): Promise<AuditChainReport["break"]> {
  if (row.action !== "run.sign" || row.entity !== "run" || !row.entity_id) return null;
  const at = { sequence, eventId: row.id };
  if (!row.subject_hash) {
    return {
      ...at,
      problem: "signature",
      detail: `sign-off ${row.id} binds no content hash`,
      expected: "a SHA-256",
      found: "none",
    };
  }
  if (row.signed_hash !== row.subject_hash) {
    return {
      ...at,
      problem: "signature",
      detail: `the signature of run ${row.entity_id} no longer holds the content hash its sign-off bound`,
      expected: row.subject_hash,
      found: row.signed_hash ?? "no signature",
    };
  }
  // Outside the snapshot's connection: a signed run never changes, and the content is read with
  // parallel queries that one transaction's connection would have to queue.
  const now = await recomputeRunContentHash(row.entity_id);
  if (now !== row.subject_hash) {
    return {
      ...at,
      problem: "signature",
      detail: `signed run ${row.entity_id} no longer has the content that was signed (it was changed after signing)`,
      expected: row.subject_hash,
      found: now ?? "the run is gone",
    };
  }
  return null;
}

async function verifyChainIn(
  teamId: string | null,
  transaction: Transaction,
): Promise<AuditChainReport> {
  let head: ChainHead | null = null;
  let checked = 0;
  for (;;) {
    const rows = await sequelize.query<ChainRow>(
      `SELECT e.id::text AS id, e.team_id::text AS team_id, e.team_seq::text AS team_seq, e.actor_id::text AS actor_id,
              e.action, e.entity, e.entity_id, e.reason, e.before::text AS before_json, e.after::text AS after_json,
              to_char(e.created_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"') AS created_at,
              e.subject_hash, e.prev_hash, e.hash, s.content_hash AS signed_hash
         FROM audit_events e
         LEFT JOIN run_signatures s ON e.action = 'run.sign' AND s.run_id::text = e.entity_id
        WHERE ${teamId === null ? "e.team_id IS NULL AND e.team_seq > $1::bigint" : "e.team_id = $2::uuid AND e.team_seq > $1::bigint"}
        ORDER BY e.team_seq
        LIMIT ${BATCH}`,
      {
        bind: teamId === null ? [head?.sequence ?? 0] : [head?.sequence ?? 0, teamId],
        type: QueryTypes.SELECT,
        transaction,
      },
    );
    for (const row of rows) {
      const event = chainedAuditEventOf(row);
      const broken = checkChainLink(head, event) ?? (await checkSignature(row, event.sequence));
      if (broken) return { teamId, ok: false, checked, head, break: broken };
      head = { sequence: event.sequence, hash: event.hash };
      checked += 1;
    }
    if (rows.length < BATCH) return { teamId, ok: true, checked, head, break: null };
  }
}

function snapshot<T>(work: (transaction: Transaction) => Promise<T>): Promise<T> {
  return sequelize.transaction(
    { isolationLevel: Transaction.ISOLATION_LEVELS.REPEATABLE_READ },
    work,
  );
}

/** Every chain in the database (each team's, and the no-team one): for `npm run audit:verify`. */
export async function verifyAllAuditChains(): Promise<AuditChainReport[]> {
  return snapshot(async (transaction) => {
    const teams = await sequelize.query<{ team_id: string | null }>(
      "SELECT DISTINCT team_id::text AS team_id FROM audit_events ORDER BY 1 NULLS FIRST",
      { type: QueryTypes.SELECT, transaction },
    );
    const reports: AuditChainReport[] = [];
    for (const { team_id } of teams) reports.push(await verifyChainIn(team_id, transaction));
    return reports;
  });
}

/** One team's chain, without asking who wants it (scripts and tests). */
export function verifyTeamAuditChain(teamId: string): Promise<AuditChainReport> {
  return snapshot((transaction) => verifyChainIn(teamId, transaction));
}

/** One team's chain, for its lab leads. */
export async function verifyAuditTrail(actor: Actor, teamId: string): Promise<AuditChainReport> {
  authorize(actor, "audit.verify", { teamId });
  return verifyTeamAuditChain(teamId);
}
