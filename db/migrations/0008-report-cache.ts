// A signed run's PDF report, rendered once and kept: the run can no longer change, so neither can its
// report, and rendering costs seconds of CPU. Kept in the database (not on one server's disk) so that
// several app instances agree. Keyed by the run and the content hash its signature covers; only a
// signed run's report with that hash is accepted, and a kept report is never changed.
import type { Migration } from "../migrate";

export const up: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TABLE run_report_pdfs (
      run_id uuid NOT NULL REFERENCES runs(id),
      content_hash text NOT NULL CHECK (content_hash ~ '^[0-9a-f]{64}$'),
      pdf bytea NOT NULL,
      byte_size integer NOT NULL CHECK (byte_size = octet_length(pdf)),
      created_at timestamptz NOT NULL DEFAULT now(),
      PRIMARY KEY (run_id, content_hash)
    );

    CREATE FUNCTION run_report_pdfs_only_signed() RETURNS trigger AS $$
    BEGIN
      IF TG_OP <> 'INSERT' THEN
        RAISE EXCEPTION 'a kept report is never changed' USING ERRCODE = 'check_violation';
      END IF;
      IF NOT EXISTS (SELECT 1 FROM runs r JOIN run_signatures s ON s.run_id = r.id
                     WHERE r.id = NEW.run_id AND r.status = 'signed' AND s.content_hash = NEW.content_hash) THEN
        RAISE EXCEPTION 'only a signed run''s report is kept, under its signature''s content hash' USING ERRCODE = 'check_violation';
      END IF;
      RETURN NEW;
    END;
    $$ LANGUAGE plpgsql;
    CREATE TRIGGER run_report_pdfs_guard BEFORE INSERT OR UPDATE ON run_report_pdfs
      FOR EACH ROW EXECUTE FUNCTION run_report_pdfs_only_signed();
  `);
};

export const down: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP TABLE IF EXISTS run_report_pdfs;
    DROP FUNCTION IF EXISTS run_report_pdfs_only_signed();
  `);
};
