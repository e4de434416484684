// The audit trail's hash chain, in TypeScript: the canonical text of an event (the same text the
// database's audit_event_canonical builds, migration 0009), the chained SHA-256, and the check of one
// link. Pure, so the verifier, the tests and anyone holding an export can recompute a chain.
import { createHash } from "node:crypto";

/** The hash a team's first event chains to. */
export const AUDIT_CHAIN_GENESIS = "0".repeat(64);

/**
 * One stored event as text, the way the chain covers it: ids as text, before/after as PostgreSQL's
 * jsonb text (its own canonical form of a JSON value), the time in UTC to the microsecond.
 */
export interface ChainedAuditEvent {
  id: string;
  teamId: string | null;
  sequence: number;
  actorId: string | null;
  action: string;
  entity: string;
  entityId: string | null;
  reason: string | null;
  beforeJson: string | null;
  afterJson: string | null;
  /** YYYY-MM-DDTHH:MM:SS.ffffffZ */
  createdAt: string;
  /** For a sign-off: the SHA-256 of the run content the signature covers. */
  subjectHash: string | null;
  prevHash: string;
  hash: string;
}

const str = (value: string | null) => (value === null ? "null" : JSON.stringify(value));

/** The event's fields as a JSON object with sorted keys (before/after embedded as stored). */
export function canonicalAuditEvent(event: Omit<ChainedAuditEvent, "prevHash" | "hash">): string {
  if (!Number.isSafeInteger(event.sequence) || event.sequence < 1) {
    throw new RangeError(`An event's sequence must be a positive integer, got ${event.sequence}`);
  }
  return (
    `{"action":${str(event.action)},"actorId":${str(event.actorId)},"after":${event.afterJson ?? "null"}` +
    `,"before":${event.beforeJson ?? "null"},"createdAt":${str(event.createdAt)},"entity":${str(event.entity)}` +
    `,"entityId":${str(event.entityId)},"id":${str(event.id)},"reason":${str(event.reason)}` +
    `,"sequence":${event.sequence},"subjectHash":${str(event.subjectHash)},"teamId":${str(event.teamId)}}`
  );
}

/** SHA-256 (lower-case hex) of the previous hash, a line feed, and the event's canonical text. */
export function auditChainHash(prevHash: string, canonical: string): string {
  return createHash("sha256").update(`${prevHash}\n${canonical}`, "utf8").digest("hex");
}

/** The chain head a link is checked against: the previous event's place and hash. */
/** An audit event's chain columns as PostgreSQL returns them (snake_case, bigint and times as text). */
export interface AuditChainRow {
  id: string;
  team_id: string | null;
  team_seq: string;
  actor_id: string | null;
  action: string;
  entity: string;
  entity_id: string | null;
  reason: string | null;
  before_json: string | null;
  after_json: string | null;
  created_at: string;
  subject_hash: string | null;
  prev_hash: string;
  hash: string;
}

/** The one mapping from a stored row to the event the chain hashes. */
export function chainedAuditEventOf(row: AuditChainRow): ChainedAuditEvent {
  return {
    id: row.id,
    teamId: row.team_id,
    sequence: Number(row.team_seq),
    actorId: row.actor_id,
    action: row.action,
    entity: row.entity,
    entityId: row.entity_id,
    reason: row.reason,
    beforeJson: row.before_json,
    afterJson: row.after_json,
    createdAt: row.created_at,
    subjectHash: row.subject_hash,
    prevHash: row.prev_hash,
    hash: row.hash,
  };
}

export interface ChainHead {
  sequence: number;
  hash: string;
}

export type ChainProblem = "sequence" | "prev_hash" | "hash";

export interface ChainBreak {
  problem: ChainProblem;
  /** The sequence number at which the chain breaks (the one expected, for a gap). */
  sequence: number;
  /** The stored event at the break. */
  eventId: string;
  /** What differs, in a sentence. */
  detail: string;
  expected: string;
  found: string;
}

/**
 * Checks one event against the head before it (null for a team's first event): its sequence follows,
 * it names the previous hash, and its own hash is the hash of its content. Returns the first thing
 * that differs, or null.
 */
export function checkChainLink(
  previous: ChainHead | null,
  event: ChainedAuditEvent,
): ChainBreak | null {
  const expectedSequence = (previous?.sequence ?? 0) + 1;
  const at = { sequence: expectedSequence, eventId: event.id };
  if (event.sequence !== expectedSequence) {
    return {
      ...at,
      problem: "sequence",
      detail:
        event.sequence > expectedSequence
          ? `sequence ${expectedSequence} is missing: the next event (${event.id}) has sequence ${event.sequence} (an event was deleted or moved)`
          : `sequence ${event.sequence} comes again at event ${event.id} (an event was copied or renumbered)`,
      expected: String(expectedSequence),
      found: String(event.sequence),
    };
  }
  const expectedPrev = previous?.hash ?? AUDIT_CHAIN_GENESIS;
  if (event.prevHash !== expectedPrev) {
    return {
      ...at,
      problem: "prev_hash",
      detail: `event ${event.id} does not name the hash of the event before it (the chain was re-linked)`,
      expected: expectedPrev,
      found: event.prevHash,
    };
  }
  const recomputed = auditChainHash(event.prevHash, canonicalAuditEvent(event));
  if (event.hash !== recomputed) {
    return {
      ...at,
      problem: "hash",
      detail: `event ${event.id} no longer matches its hash: a field was changed after it was written`,
      expected: recomputed,
      found: event.hash,
    };
  }
  return null;
}
