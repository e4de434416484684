// The chemist's workflow: instruments, uploaded spectra (raw bytes kept byte for byte with their
// SHA-256), lamp calibrations, notebooks and identification runs. Raw files never change once
// stored, and calibrations and runs are records of what was done: the database refuses edits to them.
import type { Migration } from "../migrate";

export const up: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TABLE instruments (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      name text NOT NULL CHECK (btrim(name) <> ''),
      dispersion text NOT NULL CHECK (dispersion IN ('prism', 'grating')),
      pixels integer NOT NULL CHECK (pixels >= 16),
      nominal_min_nm double precision NOT NULL CHECK (nominal_min_nm > 0),
      nominal_max_nm double precision NOT NULL,
      resolution_nm double precision NOT NULL CHECK (resolution_nm > 0),
      detector_max double precision CHECK (detector_max > 0),
      glass text,
      apex_deg double precision CHECK (apex_deg > 0 AND apex_deg < 90),
      created_by_id uuid REFERENCES users(id),
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      CONSTRAINT instruments_range_ordered CHECK (nominal_max_nm > nominal_min_nm),
      CONSTRAINT instruments_name_once_per_team UNIQUE (team_id, name)
    );

    -- x_values and y_values hold the parsed points as little-endian float64 arrays.
    CREATE TABLE spectrum_files (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      instrument_id uuid NOT NULL REFERENCES instruments(id),
      kind text NOT NULL CHECK (kind IN ('lamp', 'sample')),
      label text NOT NULL DEFAULT '',
      file_name text NOT NULL,
      byte_size integer NOT NULL CHECK (byte_size >= 0),
      sha256 text NOT NULL CHECK (sha256 ~ '^[0-9a-f]{64}$'),
      raw_bytes bytea NOT NULL,
      x_unit text NOT NULL CHECK (x_unit IN ('pixel', 'nm', 'angstrom', 'wavenumber')),
      medium text CHECK (medium IN ('air', 'vacuum')),
      point_count integer NOT NULL CHECK (point_count > 0),
      x_values bytea NOT NULL,
      y_values bytea NOT NULL,
      meta jsonb NOT NULL DEFAULT '{}',
      uploaded_by_id uuid REFERENCES users(id),
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      CONSTRAINT spectrum_files_size_matches CHECK (octet_length(raw_bytes) = byte_size),
      CONSTRAINT spectrum_files_points_match CHECK (
        octet_length(x_values) = 8 * point_count AND octet_length(y_values) = 8 * point_count
      )
    );
    CREATE INDEX spectrum_files_team_sha256 ON spectrum_files (team_id, sha256);
    CREATE INDEX spectrum_files_instrument ON spectrum_files (instrument_id, created_at);

    CREATE TABLE calibrations (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      instrument_id uuid NOT NULL REFERENCES instruments(id),
      spectrum_id uuid NOT NULL REFERENCES spectrum_files(id),
      line_release_id uuid NOT NULL REFERENCES line_releases(id),
      previous_calibration_id uuid REFERENCES calibrations(id),
      lamps text[] NOT NULL,
      requested_model text NOT NULL,
      model_kind text NOT NULL CHECK (model_kind IN ('polynomial', 'hartmann', 'prism')),
      model jsonb NOT NULL,
      x_unit text NOT NULL CHECK (x_unit IN ('pixel', 'nm', 'angstrom', 'wavenumber')),
      pairs jsonb NOT NULL,
      rejected jsonb NOT NULL,
      rms_nm double precision NOT NULL CHECK (rms_nm >= 0),
      dof integer NOT NULL,
      covered_min_nm double precision NOT NULL,
      covered_max_nm double precision NOT NULL,
      uncertainty jsonb NOT NULL,
      drift jsonb,
      pairing jsonb NOT NULL,
      warnings jsonb NOT NULL DEFAULT '[]',
      software_version text NOT NULL,
      calibrated_on date NOT NULL DEFAULT current_date,
      created_by_id uuid REFERENCES users(id),
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX calibrations_instrument ON calibrations (instrument_id, created_at DESC);

    CREATE TABLE notebooks (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      title text NOT NULL CHECK (btrim(title) <> ''),
      created_by_id uuid REFERENCES users(id),
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX notebooks_team ON notebooks (team_id, created_at DESC);

    CREATE TABLE runs (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      notebook_id uuid NOT NULL REFERENCES notebooks(id),
      spectrum_id uuid NOT NULL REFERENCES spectrum_files(id),
      calibration_id uuid REFERENCES calibrations(id),
      line_release_id uuid NOT NULL REFERENCES line_releases(id),
      source text NOT NULL CHECK (source IN ('flame', 'arc', 'spark', 'plasma', 'lamp')),
      status text NOT NULL CHECK (status IN ('complete')),
      settings jsonb NOT NULL,
      lamp_checked boolean NOT NULL,
      software_version text NOT NULL,
      range_min_nm double precision NOT NULL,
      range_max_nm double precision NOT NULL,
      noise_counts double precision NOT NULL,
      peaks jsonb NOT NULL,
      matches jsonb NOT NULL,
      calls jsonb NOT NULL,
      peak_overlaps jsonb NOT NULL,
      unexplained jsonb NOT NULL,
      warnings jsonb NOT NULL DEFAULT '[]',
      created_by_id uuid REFERENCES users(id),
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX runs_notebook ON runs (notebook_id, created_at DESC);

    -- A raw file is kept byte for byte: its bytes, hash and parsed points never change.
    CREATE FUNCTION spectrum_files_refuse_change() RETURNS trigger AS $$
    BEGIN
      IF NEW.raw_bytes IS DISTINCT FROM OLD.raw_bytes OR NEW.sha256 IS DISTINCT FROM OLD.sha256
         OR NEW.x_values IS DISTINCT FROM OLD.x_values OR NEW.y_values IS DISTINCT FROM OLD.y_values THEN
        RAISE EXCEPTION 'an uploaded spectrum file never changes' USING ERRCODE = 'check_violation';
      END IF;
      RETURN NEW;
    END;
    $$ LANGUAGE plpgsql;
    CREATE TRIGGER spectrum_files_frozen BEFORE UPDATE ON spectrum_files
      FOR EACH ROW EXECUTE FUNCTION spectrum_files_refuse_change();

    -- Calibrations and runs record what was computed, with what: they are never edited.
    CREATE FUNCTION workflow_records_refuse_update() RETURNS trigger AS $$
    BEGIN
      RAISE EXCEPTION '% rows are records and cannot be changed', TG_TABLE_NAME USING ERRCODE = 'check_violation';
    END;
    $$ LANGUAGE plpgsql;
    CREATE TRIGGER calibrations_frozen BEFORE UPDATE ON calibrations
      FOR EACH ROW EXECUTE FUNCTION workflow_records_refuse_update();
    CREATE TRIGGER runs_frozen BEFORE UPDATE ON runs
      FOR EACH ROW EXECUTE FUNCTION workflow_records_refuse_update();
  `);
};

export const down: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP TABLE IF EXISTS runs, notebooks, calibrations, spectrum_files, instruments CASCADE;
    DROP FUNCTION IF EXISTS workflow_records_refuse_update();
    DROP FUNCTION IF EXISTS spectrum_files_refuse_change();
  `);
};
