// The audit hash chain in TypeScript: the canonical text of an event, the chained SHA-256, and the
// check of each link (a changed field, a re-linked chain, a deleted or repeated event).
import { describe, expect, it } from "vitest";
import {
  AUDIT_CHAIN_GENESIS,
  auditChainHash,
  canonicalAuditEvent,
  checkChainLink,
  type ChainHead,
  type ChainedAuditEvent,
} from "@/lib/audit/audit-chain";

type Fields = Omit<ChainedAuditEvent, "prevHash" | "hash">;

const TEAM = "82183628-98da-4967-a25d-40c50f0c4324";

const SIGN: Fields = {
  id: "42",
  teamId: TEAM,
  sequence: 1,
  actorId: "3f1c1a4e-9d51-4a57-9c1e-1b8f0a0e6b11",
  action: "run.sign",
  entity: "run",
  entityId: "7b0d9a56-0e4c-4f0e-8d57-2c5a3c9e1f20",
  reason: null,
  beforeJson: '{"status": "submitted"}',
  afterJson: '{"status": "signed"}',
  createdAt: "2026-12-02T15:04:05.123456Z",
  subjectHash: "a45b2d6d04ed8382cd0ea8e46c4a4514bbb6e278a72ac97d2794c9b7bf3e3a8e",
};

/** A chain of events built the way the database's trigger builds it. */
function chain(fields: Fields[]): ChainedAuditEvent[] {
  let prev = AUDIT_CHAIN_GENESIS;
  return fields.map((f) => {
    const hash = auditChainHash(prev, canonicalAuditEvent(f));
    const event = { ...f, prevHash: prev, hash };
    prev = hash;
    return event;
  });
}

function firstBreak(events: ChainedAuditEvent[]) {
  let head: ChainHead | null = null;
  for (const event of events) {
    const broken = checkChainLink(head, event);
    if (broken) return broken;
    head = { sequence: event.sequence, hash: event.hash };
  }
  return null;
}

function events(n: number): Fields[] {
  return Array.from({ length: n }, (_, i) => ({
    ...SIGN,
    id: String(100 + i),
    sequence: i + 1,
    action: i % 2 ? "run.notes" : "run.create",
    reason: i === 2 ? 'a "quoted"\nreason, ünïcode' : null,
    subjectHash: null,
  }));
}

describe("canonicalAuditEvent", () => {
  it("writes the fields as a JSON object with sorted keys, before/after as stored", () => {
    const text = canonicalAuditEvent(SIGN);
    const parsed = JSON.parse(text) as Record<string, unknown>;
    expect(Object.keys(parsed)).toEqual(Object.keys(parsed).slice().sort());
    expect(Object.keys(parsed)).toEqual([
      "action",
      "actorId",
      "after",
      "before",
      "createdAt",
      "entity",
      "entityId",
      "id",
      "reason",
      "sequence",
      "subjectHash",
      "teamId",
    ]);
    expect(text).toContain('"after":{"status": "signed"}');
    expect(parsed.sequence).toBe(1);
    expect(parsed.reason).toBeNull();
  });

  it("escapes text as JSON does", () => {
    const text = canonicalAuditEvent({ ...SIGN, reason: 'line 1\nline 2 "q" \\ \u0001' });
    expect((JSON.parse(text) as { reason: string }).reason).toBe('line 1\nline 2 "q" \\ \u0001');
    expect(text).toContain('"reason":"line 1\\nline 2 \\"q\\" \\\\ \\u0001"');
  });

  it("refuses a sequence that is not a positive integer", () => {
    expect(() => canonicalAuditEvent({ ...SIGN, sequence: 0 })).toThrow(RangeError);
    expect(() => canonicalAuditEvent({ ...SIGN, sequence: 1.5 })).toThrow(RangeError);
  });
});

describe("auditChainHash", () => {
  it("is the SHA-256 of the previous hash, a line feed and the canonical text", () => {
    // Source: GNU coreutils 9.1 `sha256sum` of the same bytes
    // (printf '%s\n%s' "<64 zeros>" '<the canonical text>' | sha256sum).
    expect(auditChainHash(AUDIT_CHAIN_GENESIS, canonicalAuditEvent(SIGN))).toBe(
      "1650c2eaff7dfabf8bbc9538a796fa8f1729399557e5cc16ad1df4fb58c16732",
    );
  });

  it("changes with the previous hash and with any field", () => {
    const base = auditChainHash(AUDIT_CHAIN_GENESIS, canonicalAuditEvent(SIGN));
    expect(auditChainHash("1".repeat(64), canonicalAuditEvent(SIGN))).not.toBe(base);
    for (const change of [
      { reason: "" },
      { actorId: null },
      { afterJson: '{"status": "draft"}' },
      { createdAt: "2026-12-02T15:04:05.123457Z" },
      { subjectHash: "b".repeat(64) },
      { teamId: null },
      { sequence: 2 },
    ] satisfies Partial<Fields>[]) {
      expect(
        auditChainHash(AUDIT_CHAIN_GENESIS, canonicalAuditEvent({ ...SIGN, ...change })),
        JSON.stringify(change),
      ).not.toBe(base);
    }
  });
});

describe("checkChainLink", () => {
  it("accepts an untouched chain", () => {
    expect(firstBreak(chain(events(5)))).toBeNull();
  });

  it("names the first event whose content was changed", () => {
    const trail = chain(events(5));
    trail[2] = { ...trail[2], reason: "rewritten" };
    trail[3] = { ...trail[3], action: "run.sign" };
    const broken = firstBreak(trail);
    expect(broken).toMatchObject({
      problem: "hash",
      sequence: 3,
      eventId: "102",
      found: trail[2].hash,
    });
    expect(broken!.expected).not.toBe(trail[2].hash);
  });

  it("notices a rewritten event whose hash was recomputed, at the next link", () => {
    const trail = chain(events(4));
    const rewritten = { ...trail[1], reason: "rewritten" };
    trail[1] = {
      ...rewritten,
      hash: auditChainHash(rewritten.prevHash, canonicalAuditEvent(rewritten)),
    };
    expect(firstBreak(trail)).toMatchObject({ problem: "prev_hash", sequence: 3, eventId: "102" });
  });

  it("notices a deleted event as a gap in the sequence", () => {
    const trail = chain(events(5));
    trail.splice(1, 1);
    expect(firstBreak(trail)).toMatchObject({
      problem: "sequence",
      sequence: 2,
      eventId: "102",
      expected: "2",
      found: "3",
    });
  });

  it("notices a repeated sequence number", () => {
    const trail = chain(events(3));
    const copy = { ...trail[1], id: "999" };
    expect(firstBreak([trail[0], trail[1], copy])).toMatchObject({
      problem: "sequence",
      sequence: 3,
      found: "2",
    });
  });

  it("expects a team's first event to chain to the genesis hash", () => {
    const [first] = chain(events(1));
    expect(checkChainLink(null, { ...first, prevHash: "f".repeat(64) })).toMatchObject({
      problem: "prev_hash",
      sequence: 1,
      expected: AUDIT_CHAIN_GENESIS,
    });
  });
});
