// An override changes a run's standing verdicts and so the content a signature covers: the database
// refuses one on a run that waits for review or is signed, even if a service forgot to ask.
import type { Migration } from "../migrate";

export const up: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE FUNCTION run_overrides_only_while_editable() RETURNS trigger AS $$
    BEGIN
      IF (SELECT status FROM runs WHERE id = NEW.run_id) IN ('submitted', 'signed') THEN
        RAISE EXCEPTION 'a submitted or signed run takes no override' USING ERRCODE = 'check_violation';
      END IF;
      RETURN NEW;
    END;
    $$ LANGUAGE plpgsql;
    CREATE TRIGGER run_overrides_editable BEFORE INSERT ON run_overrides
      FOR EACH ROW EXECUTE FUNCTION run_overrides_only_while_editable();
  `);
};

export const down: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP TRIGGER IF EXISTS run_overrides_editable ON run_overrides;
    DROP FUNCTION IF EXISTS run_overrides_only_while_editable();
  `);
};
