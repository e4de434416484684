// Runs become notebook entries with a life: a draft the author may annotate (notes, overridden
// calls), submitted for review, returned with comments, resubmitted, and signed. The analysis
// columns stay frozen for ever; the workflow columns may change until the run is signed, after
// which the database refuses every change. Review rounds, per-call review marks, overrides and
// signatures are append-only records.
import type { Migration } from "../migrate";

export const up: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP TRIGGER runs_frozen ON runs;

    ALTER TABLE runs DROP CONSTRAINT runs_status_check;
    UPDATE runs SET status = 'draft' WHERE status = 'complete';
    ALTER TABLE runs
      ADD CONSTRAINT runs_status_check CHECK (status IN ('draft', 'submitted', 'returned', 'signed')),
      ALTER COLUMN status SET DEFAULT 'draft',
      -- A signed run is amended by a new version linked to it; a re-run against a newer
      -- line-table release links to the run it repeats.
      ADD COLUMN version_number integer NOT NULL DEFAULT 1 CHECK (version_number >= 1),
      ADD COLUMN amends_run_id uuid REFERENCES runs(id),
      ADD COLUMN rerun_of_id uuid REFERENCES runs(id),
      ADD COLUMN notes text NOT NULL DEFAULT '',
      ADD COLUMN review_round integer NOT NULL DEFAULT 0 CHECK (review_round >= 0),
      ADD COLUMN requested_reviewer_id uuid REFERENCES users(id),
      ADD COLUMN submitted_at timestamptz,
      ADD COLUMN signed_at timestamptz,
      ADD COLUMN lock_version integer NOT NULL DEFAULT 0,
      -- Computed with the analysis (frozen like it): the Boltzmann temperature when it could be
      -- found, and the continuum under the sample as little-endian float64 on the analysed points.
      ADD COLUMN temperature jsonb,
      ADD COLUMN continuum bytea;
    CREATE UNIQUE INDEX runs_one_amendment ON runs (amends_run_id) WHERE amends_run_id IS NOT NULL;
    CREATE INDEX runs_team_status ON runs (team_id, status, submitted_at);

    CREATE FUNCTION runs_guard_update() RETURNS trigger AS $$
    DECLARE
      workflow_columns text[] := ARRAY['status', 'notes', 'review_round', 'requested_reviewer_id',
        'submitted_at', 'signed_at', 'lock_version', 'updated_at'];
    BEGIN
      IF OLD.status = 'signed' THEN
        RAISE EXCEPTION 'a signed run is never edited: amend it instead' USING ERRCODE = 'check_violation';
      END IF;
      IF (to_jsonb(OLD) - workflow_columns) IS DISTINCT FROM (to_jsonb(NEW) - workflow_columns) THEN
        RAISE EXCEPTION 'the analysis of a run is a record and cannot be changed' USING ERRCODE = 'check_violation';
      END IF;
      RETURN NEW;
    END;
    $$ LANGUAGE plpgsql;
    CREATE TRIGGER runs_guarded BEFORE UPDATE ON runs
      FOR EACH ROW EXECUTE FUNCTION runs_guard_update();

    CREATE FUNCTION runs_refuse_delete() RETURNS trigger AS $$
    BEGIN
      RAISE EXCEPTION 'runs are records and are never deleted' USING ERRCODE = 'check_violation';
    END;
    $$ LANGUAGE plpgsql;
    CREATE TRIGGER runs_kept BEFORE DELETE ON runs
      FOR EACH ROW WHEN (pg_trigger_depth() = 0) EXECUTE FUNCTION runs_refuse_delete();

    -- A chemist's change of a call's verdict, with the reason; the newest per species applies.
    -- verdict NULL withdraws the override and the computed verdict applies again.
    CREATE TABLE run_overrides (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      run_id uuid NOT NULL REFERENCES runs(id),
      species text NOT NULL,
      computed_verdict text NOT NULL CHECK (computed_verdict IN ('present', 'possible', 'absent')),
      verdict text CHECK (verdict IN ('present', 'possible', 'absent')),
      reason text NOT NULL CHECK (btrim(reason) <> ''),
      created_by_id uuid REFERENCES users(id),
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX run_overrides_run ON run_overrides (run_id, created_at);

    -- One review round: a submission and, once decided, its outcome.
    CREATE TABLE run_rounds (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      run_id uuid NOT NULL REFERENCES runs(id),
      round integer NOT NULL CHECK (round >= 1),
      submitted_by_id uuid REFERENCES users(id),
      submitted_at timestamptz NOT NULL DEFAULT now(),
      requested_reviewer_id uuid REFERENCES users(id),
      decision text CHECK (decision IN ('returned', 'signed')),
      decided_by_id uuid REFERENCES users(id),
      decided_at timestamptz,
      comment text NOT NULL DEFAULT '',
      CONSTRAINT run_rounds_once UNIQUE (run_id, round),
      CONSTRAINT run_rounds_decided CHECK ((decision IS NULL) = (decided_at IS NULL))
    );

    -- A reviewer's mark on a call (agree/disagree) or a comment on a call or one of its lines.
    CREATE TABLE run_review_marks (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      run_id uuid NOT NULL REFERENCES runs(id),
      round integer NOT NULL CHECK (round >= 1),
      reviewer_id uuid REFERENCES users(id),
      species text NOT NULL,
      line_nm double precision,
      agreement text CHECK (agreement IN ('agree', 'disagree')),
      comment text NOT NULL DEFAULT '',
      created_at timestamptz NOT NULL DEFAULT now(),
      CONSTRAINT run_review_marks_says_something CHECK (agreement IS NOT NULL OR btrim(comment) <> '')
    );
    CREATE INDEX run_review_marks_run ON run_review_marks (run_id, round);

    -- An electronic signature: who, when, what it means, and the SHA-256 of the record signed.
    CREATE TABLE run_signatures (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      run_id uuid NOT NULL UNIQUE REFERENCES runs(id),
      round integer NOT NULL CHECK (round >= 1),
      signer_id uuid NOT NULL REFERENCES users(id),
      signer_name text NOT NULL,
      meaning text NOT NULL CHECK (btrim(meaning) <> ''),
      content_hash text NOT NULL CHECK (content_hash ~ '^[0-9a-f]{64}$'),
      signed_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE FUNCTION review_records_refuse_change() RETURNS trigger AS $$
    BEGIN
      RAISE EXCEPTION '% rows are records and cannot be changed', TG_TABLE_NAME USING ERRCODE = 'check_violation';
    END;
    $$ LANGUAGE plpgsql;
    CREATE TRIGGER run_overrides_frozen BEFORE UPDATE OR DELETE ON run_overrides
      FOR EACH ROW EXECUTE FUNCTION review_records_refuse_change();
    CREATE TRIGGER run_review_marks_frozen BEFORE UPDATE OR DELETE ON run_review_marks
      FOR EACH ROW EXECUTE FUNCTION review_records_refuse_change();
    CREATE TRIGGER run_signatures_frozen BEFORE UPDATE OR DELETE ON run_signatures
      FOR EACH ROW EXECUTE FUNCTION review_records_refuse_change();

    -- A round is decided once: after that it never changes.
    CREATE FUNCTION run_rounds_decide_once() RETURNS trigger AS $$
    BEGIN
      IF TG_OP = 'DELETE' OR OLD.decision IS NOT NULL THEN
        RAISE EXCEPTION 'a decided review round cannot be changed' USING ERRCODE = 'check_violation';
      END IF;
      IF NEW.run_id IS DISTINCT FROM OLD.run_id OR NEW.round IS DISTINCT FROM OLD.round
         OR NEW.submitted_by_id IS DISTINCT FROM OLD.submitted_by_id OR NEW.submitted_at IS DISTINCT FROM OLD.submitted_at THEN
        RAISE EXCEPTION 'a review round''s submission cannot be changed' USING ERRCODE = 'check_violation';
      END IF;
      RETURN NEW;
    END;
    $$ LANGUAGE plpgsql;
    CREATE TRIGGER run_rounds_guarded BEFORE UPDATE OR DELETE ON run_rounds
      FOR EACH ROW EXECUTE FUNCTION run_rounds_decide_once();
  `);
};

export const down: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP TABLE IF EXISTS run_signatures, run_review_marks, run_rounds, run_overrides CASCADE;
    DROP FUNCTION IF EXISTS review_records_refuse_change() CASCADE;
    DROP FUNCTION IF EXISTS run_rounds_decide_once() CASCADE;
    DROP TRIGGER IF EXISTS runs_kept ON runs;
    DROP FUNCTION IF EXISTS runs_refuse_delete();
    DROP TRIGGER IF EXISTS runs_guarded ON runs;
    DROP FUNCTION IF EXISTS runs_guard_update();
    DROP INDEX IF EXISTS runs_one_amendment;
    DROP INDEX IF EXISTS runs_team_status;
    ALTER TABLE runs DROP CONSTRAINT runs_status_check;
    ALTER TABLE runs
      DROP COLUMN version_number, DROP COLUMN amends_run_id, DROP COLUMN rerun_of_id, DROP COLUMN notes,
      DROP COLUMN review_round, DROP COLUMN requested_reviewer_id, DROP COLUMN submitted_at,
      DROP COLUMN signed_at, DROP COLUMN lock_version, DROP COLUMN temperature, DROP COLUMN continuum;
    UPDATE runs SET status = 'complete';
    ALTER TABLE runs ADD CONSTRAINT runs_status_check CHECK (status IN ('complete'));
    CREATE TRIGGER runs_frozen BEFORE UPDATE ON runs FOR EACH ROW EXECUTE FUNCTION workflow_records_refuse_update();
  `);
};
