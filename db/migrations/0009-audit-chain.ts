// A tamper-evident audit trail: every event carries its place in its team's chain (team_seq), the
// previous event's hash and its own, SHA-256 over the previous hash and the event's canonical text.
// A trigger computes them on INSERT, whoever inserts and however (the app, the seed, psql), so the app
// cannot choose them; a per-team advisory lock held to the end of the inserting transaction makes
// concurrent inserts chain one after the other. A sign-off event also binds the signature's content
// hash (subject_hash) into the chain. Events written before this migration are chained here, in id
// order. `npm run audit:verify` and GET /api/audit/verify recompute the chain (lib/audit/audit-chain.ts
// is the same canonical form in TypeScript).
import type { Migration } from "../migrate";

export const up: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE audit_events
      ADD COLUMN team_seq bigint,
      ADD COLUMN subject_hash text CHECK (subject_hash ~ '^[0-9a-f]{64}$'),
      ADD COLUMN prev_hash text,
      ADD COLUMN hash text;

    -- The canonical text of an event: a JSON object with its fields in sorted key order; before and
    -- after appear as PostgreSQL's own canonical jsonb text, the time in UTC to the microsecond.
    CREATE FUNCTION audit_event_canonical(e audit_events) RETURNS text
      LANGUAGE sql STABLE AS $$
      SELECT '{"action":' || to_jsonb(e.action)::text
        || ',"actorId":' || coalesce(to_jsonb(e.actor_id::text)::text, 'null')
        || ',"after":' || coalesce(e.after::text, 'null')
        || ',"before":' || coalesce(e.before::text, 'null')
        || ',"createdAt":' || to_jsonb(to_char(e.created_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"'))::text
        || ',"entity":' || to_jsonb(e.entity)::text
        || ',"entityId":' || coalesce(to_jsonb(e.entity_id)::text, 'null')
        || ',"id":' || to_jsonb(e.id::text)::text
        || ',"reason":' || coalesce(to_jsonb(e.reason)::text, 'null')
        || ',"sequence":' || e.team_seq::text
        || ',"subjectHash":' || coalesce(to_jsonb(e.subject_hash)::text, 'null')
        || ',"teamId":' || coalesce(to_jsonb(e.team_id::text)::text, 'null')
        || '}'
    $$;

    CREATE FUNCTION audit_event_hash(prev_hash text, canonical text) RETURNS text
      LANGUAGE sql IMMUTABLE AS $$
      SELECT encode(sha256(convert_to(prev_hash || E'\\n' || canonical, 'UTF8')), 'hex')
    $$;

    CREATE FUNCTION audit_events_chain() RETURNS trigger AS $$
    DECLARE
      head record;
    BEGIN
      -- One writer per team chain at a time, until its transaction ends.
      PERFORM pg_advisory_xact_lock(hashtextextended('emberline.audit_chain:' || coalesce(NEW.team_id::text, '-'), 0));
      IF NEW.team_id IS NULL THEN
        SELECT team_seq, hash INTO head FROM audit_events WHERE team_id IS NULL ORDER BY team_seq DESC LIMIT 1;
      ELSE
        SELECT team_seq, hash INTO head FROM audit_events WHERE team_id = NEW.team_id ORDER BY team_seq DESC LIMIT 1;
      END IF;
      NEW.team_seq := coalesce(head.team_seq, 0) + 1;
      NEW.prev_hash := coalesce(head.hash, repeat('0', 64));
      -- A signature binds the content it signed: the signature row comes first in the same transaction.
      IF NEW.action = 'run.sign' AND NEW.entity = 'run' THEN
        SELECT content_hash INTO NEW.subject_hash FROM run_signatures WHERE run_id::text = NEW.entity_id;
      END IF;
      NEW.hash := audit_event_hash(NEW.prev_hash, audit_event_canonical(NEW));
      RETURN NEW;
    END;
    $$ LANGUAGE plpgsql;

    -- Chain what is already there (the append-only trigger is set aside for this one transaction).
    ALTER TABLE audit_events DISABLE TRIGGER audit_events_no_update;
    DO $$
    DECLARE
      e audit_events;
      last_team uuid;
      first boolean := true;
      seq bigint;
      prev text;
    BEGIN
      FOR e IN SELECT * FROM audit_events ORDER BY team_id NULLS FIRST, id LOOP
        IF first OR e.team_id IS DISTINCT FROM last_team THEN
          seq := 0;
          prev := repeat('0', 64);
        END IF;
        first := false;
        last_team := e.team_id;
        seq := seq + 1;
        e.team_seq := seq;
        e.prev_hash := prev;
        IF e.action = 'run.sign' AND e.entity = 'run' THEN
          SELECT content_hash INTO e.subject_hash FROM run_signatures WHERE run_id::text = e.entity_id;
        END IF;
        e.hash := audit_event_hash(prev, audit_event_canonical(e));
        UPDATE audit_events SET team_seq = e.team_seq, prev_hash = e.prev_hash, subject_hash = e.subject_hash, hash = e.hash
          WHERE id = e.id;
        prev := e.hash;
      END LOOP;
    END $$;
    ALTER TABLE audit_events ENABLE TRIGGER audit_events_no_update;

    ALTER TABLE audit_events
      ALTER COLUMN team_seq SET NOT NULL,
      ALTER COLUMN prev_hash SET NOT NULL,
      ALTER COLUMN hash SET NOT NULL,
      ADD CONSTRAINT audit_events_hashes_hex CHECK (prev_hash ~ '^[0-9a-f]{64}$' AND hash ~ '^[0-9a-f]{64}$');
    CREATE UNIQUE INDEX audit_events_team_chain
      ON audit_events ((coalesce(team_id, '00000000-0000-0000-0000-000000000000'::uuid)), team_seq);
    CREATE INDEX audit_events_team_seq ON audit_events (team_id, team_seq DESC);

    CREATE TRIGGER audit_events_chained BEFORE INSERT ON audit_events
      FOR EACH ROW EXECUTE FUNCTION audit_events_chain();
  `);
};

export const down: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP TRIGGER IF EXISTS audit_events_chained ON audit_events;
    DROP FUNCTION IF EXISTS audit_events_chain();
    DROP INDEX IF EXISTS audit_events_team_chain;
    DROP INDEX IF EXISTS audit_events_team_seq;
    ALTER TABLE audit_events DROP CONSTRAINT IF EXISTS audit_events_hashes_hex,
      DROP COLUMN team_seq, DROP COLUMN subject_hash, DROP COLUMN prev_hash, DROP COLUMN hash;
    DROP FUNCTION IF EXISTS audit_event_hash(text, text);
    DROP FUNCTION IF EXISTS audit_event_canonical(audit_events);
  `);
};
