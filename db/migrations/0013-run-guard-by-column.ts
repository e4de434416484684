// A run's analysis columns are refused in an UPDATE's SET list by name, instead of by comparing the
// whole row as JSON before and after: that comparison turned every notes save into a conversion of
// the run's stored candidate lines (megabytes against a large line table) and its continuum, twice,
// and was most of a notes save's cost under load. A signed run still refuses every change. A column
// added to runs later must join this trigger's list (a later migration re-creates the trigger) unless
// it is a workflow column: tests/integration/run-guard.test.ts fails until it is one or the other.
import type { Migration } from "../migrate";

/**
 * Everything the analysis computed or was computed from: never updated. The others (status, notes,
 * review_round, requested_reviewer_id, submitted_at, signed_at, lock_version, updated_at) are the
 * workflow's and may change until the run is signed.
 */
const RUN_ANALYSIS_COLUMNS = [
  "id",
  "team_id",
  "notebook_id",
  "spectrum_id",
  "calibration_id",
  "line_release_id",
  "source",
  "settings",
  "lamp_checked",
  "software_version",
  "range_min_nm",
  "range_max_nm",
  "noise_counts",
  "peaks",
  "matches",
  "calls",
  "peak_overlaps",
  "unexplained",
  "warnings",
  "created_by_id",
  "created_at",
  "version_number",
  "amends_run_id",
  "rerun_of_id",
  "temperature",
  "continuum",
];

export const up: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE OR REPLACE FUNCTION runs_guard_update() RETURNS trigger AS $$
    BEGIN
      IF OLD.status = 'signed' THEN
        RAISE EXCEPTION 'a signed run is never edited: amend it instead' USING ERRCODE = 'check_violation';
      END IF;
      RETURN NEW;
    END;
    $$ LANGUAGE plpgsql;

    CREATE FUNCTION runs_refuse_analysis_change() RETURNS trigger AS $$
    BEGIN
      RAISE EXCEPTION 'the analysis of a run is a record and cannot be changed' USING ERRCODE = 'check_violation';
    END;
    $$ LANGUAGE plpgsql;
    CREATE TRIGGER runs_analysis_frozen BEFORE UPDATE OF ${RUN_ANALYSIS_COLUMNS.join(", ")} ON runs
      FOR EACH ROW EXECUTE FUNCTION runs_refuse_analysis_change();
  `);
};

export const down: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP TRIGGER runs_analysis_frozen ON runs;
    DROP FUNCTION runs_refuse_analysis_change();
    CREATE OR REPLACE FUNCTION runs_guard_update() RETURNS trigger AS $$
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
  `);
};
