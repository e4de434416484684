// The line library: releases (one editable draft per team, published ones frozen) and their line rows.
// The database itself refuses any change to a published release or to the lines it holds, so that
// results tied to a release can always be reproduced from it, whatever code runs against the tables.
import type { Migration } from "../migrate";

export const up: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TYPE line_release_status AS ENUM ('draft', 'published');

    CREATE TABLE line_releases (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      number integer CHECK (number > 0),
      status line_release_status NOT NULL DEFAULT 'draft',
      notes text NOT NULL DEFAULT '',
      based_on_release_id uuid REFERENCES line_releases(id),
      created_by_id uuid REFERENCES users(id),
      published_by_id uuid REFERENCES users(id),
      published_at timestamptz,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      CONSTRAINT line_releases_number_matches_status CHECK (
        (status = 'draft' AND number IS NULL AND published_at IS NULL)
        OR (status = 'published' AND number IS NOT NULL AND published_at IS NOT NULL)
      ),
      UNIQUE (team_id, number)
    );
    CREATE UNIQUE INDEX line_releases_one_draft_per_team ON line_releases (team_id) WHERE status = 'draft';

    CREATE TABLE lines (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      release_id uuid NOT NULL REFERENCES line_releases(id) ON DELETE CASCADE,
      line_key uuid NOT NULL DEFAULT gen_random_uuid(),
      species text NOT NULL CHECK (btrim(species) <> ''),
      element text NOT NULL CHECK (btrim(element) <> ''),
      ion_stage smallint CHECK (ion_stage BETWEEN 1 AND 10),
      air_nm double precision CHECK (air_nm > 0),
      vacuum_nm double precision NOT NULL CHECK (vacuum_nm > 0),
      uncertainty_nm double precision CHECK (uncertainty_nm > 0),
      intensity_flame double precision CHECK (intensity_flame >= 0),
      intensity_arc double precision CHECK (intensity_arc >= 0),
      intensity_spark double precision CHECK (intensity_spark >= 0),
      intensity_plasma double precision CHECK (intensity_plasma >= 0),
      intensity_lamp double precision CHECK (intensity_lamp >= 0),
      lower_ev double precision CHECK (lower_ev >= 0),
      upper_ev double precision CHECK (upper_ev >= 0),
      g_upper integer CHECK (g_upper > 0),
      a_per_s double precision CHECK (a_per_s > 0),
      flags text[] NOT NULL DEFAULT '{}'
        CHECK (flags <@ ARRAY['persistent', 'lamp', 'band-head', 'resonance', 'blend']::text[]),
      band_extent_nm double precision CHECK (band_extent_nm > 0),
      band_degrades_to text CHECK (band_degrades_to IN ('red', 'violet')),
      source text NOT NULL CHECK (btrim(source) <> ''),
      note text NOT NULL DEFAULT '',
      verified_by_id uuid REFERENCES users(id),
      verified_at timestamptz,
      retired boolean NOT NULL DEFAULT false,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      CONSTRAINT lines_levels_ordered CHECK (upper_ev IS NULL OR lower_ev IS NULL OR upper_ev > lower_ev),
      CONSTRAINT lines_band_complete CHECK ((band_extent_nm IS NULL) = (band_degrades_to IS NULL)),
      CONSTRAINT lines_band_only_for_heads CHECK ((band_extent_nm IS NOT NULL) = ('band-head' = ANY (flags))),
      CONSTRAINT lines_verified_complete CHECK ((verified_by_id IS NULL) = (verified_at IS NULL)),
      CONSTRAINT lines_key_once_per_release UNIQUE (release_id, line_key)
    );
    -- Range queries within one release, with the count of the same filter, ride on these. Ranges
    -- compare the wavelength as tables give it (air above 200 nm, vacuum below: coalesce(air, vacuum))
    -- or, when asked, the vacuum wavelength; air_nm alone serves lookups of air values.
    -- INCLUDE (air_nm, vacuum_nm) lets the count run as an index-only scan on the expression.
    CREATE INDEX lines_release_tabulated_nm ON lines (release_id, (coalesce(air_nm, vacuum_nm)))
      INCLUDE (air_nm, vacuum_nm);
    CREATE INDEX lines_release_vacuum ON lines (release_id, vacuum_nm);
    CREATE INDEX lines_release_air ON lines (release_id, air_nm);
    CREATE INDEX lines_release_species ON lines (release_id, species, (coalesce(air_nm, vacuum_nm)))
      INCLUDE (air_nm, vacuum_nm);
    CREATE INDEX lines_release_element ON lines (release_id, element, (coalesce(air_nm, vacuum_nm)))
      INCLUDE (air_nm, vacuum_nm);
    CREATE INDEX lines_line_key ON lines (line_key);

    -- A published release's row never changes and is never deleted.
    CREATE FUNCTION line_releases_refuse_published_change() RETURNS trigger AS $$
    BEGIN
      IF OLD.status = 'published' THEN
        RAISE EXCEPTION 'line release % is published and cannot be changed (%)', OLD.number, TG_OP
          USING ERRCODE = 'check_violation';
      END IF;
      RETURN CASE WHEN TG_OP = 'DELETE' THEN OLD ELSE NEW END;
    END;
    $$ LANGUAGE plpgsql;
    CREATE TRIGGER line_releases_frozen BEFORE UPDATE OR DELETE ON line_releases
      FOR EACH ROW EXECUTE FUNCTION line_releases_refuse_published_change();

    -- Rows of a published release are frozen. Publishing flips the draft's status, after which its
    -- rows can no longer be touched. Statement-level triggers with transition tables keep bulk
    -- inserts (seed, import, opening a draft) at one check per statement. The releases touched are
    -- locked FOR SHARE first, so a line written while a publish is committing waits for it and then
    -- sees the release as published (each statement of a volatile function takes a fresh snapshot).
    CREATE FUNCTION lines_refuse_published_change() RETURNS trigger AS $$
    DECLARE
      frozen integer;
    BEGIN
      IF TG_OP = 'TRUNCATE' THEN
        RAISE EXCEPTION 'lines cannot be truncated: published releases never change'
          USING ERRCODE = 'check_violation';
      END IF;
      IF TG_OP IN ('INSERT', 'UPDATE') THEN
        PERFORM 1 FROM line_releases WHERE id IN (SELECT release_id FROM new_rows) FOR SHARE;
        SELECT r.number INTO frozen FROM line_releases r
          WHERE r.id IN (SELECT release_id FROM new_rows) AND r.status = 'published' LIMIT 1;
        IF FOUND THEN
          RAISE EXCEPTION 'line release % is published: its lines cannot be changed (%)', frozen, TG_OP
            USING ERRCODE = 'check_violation';
        END IF;
      END IF;
      IF TG_OP IN ('UPDATE', 'DELETE') THEN
        PERFORM 1 FROM line_releases WHERE id IN (SELECT release_id FROM old_rows) FOR SHARE;
        SELECT r.number INTO frozen FROM line_releases r
          WHERE r.id IN (SELECT release_id FROM old_rows) AND r.status = 'published' LIMIT 1;
        IF FOUND THEN
          RAISE EXCEPTION 'line release % is published: its lines cannot be changed (%)', frozen, TG_OP
            USING ERRCODE = 'check_violation';
        END IF;
      END IF;
      RETURN NULL;
    END;
    $$ LANGUAGE plpgsql;
    CREATE TRIGGER lines_frozen_insert AFTER INSERT ON lines REFERENCING NEW TABLE AS new_rows
      FOR EACH STATEMENT EXECUTE FUNCTION lines_refuse_published_change();
    CREATE TRIGGER lines_frozen_update AFTER UPDATE ON lines REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows
      FOR EACH STATEMENT EXECUTE FUNCTION lines_refuse_published_change();
    CREATE TRIGGER lines_frozen_delete AFTER DELETE ON lines REFERENCING OLD TABLE AS old_rows
      FOR EACH STATEMENT EXECUTE FUNCTION lines_refuse_published_change();
    CREATE TRIGGER lines_no_truncate BEFORE TRUNCATE ON lines
      FOR EACH STATEMENT EXECUTE FUNCTION lines_refuse_published_change();
  `);
};

export const down: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP TABLE IF EXISTS lines, line_releases CASCADE;
    DROP FUNCTION IF EXISTS lines_refuse_published_change();
    DROP FUNCTION IF EXISTS line_releases_refuse_published_change();
    DROP TYPE IF EXISTS line_release_status;
  `);
};
