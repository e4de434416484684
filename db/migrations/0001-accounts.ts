// Accounts, teams, memberships, invitations, reset tokens, access tokens, sign-in attempts and
// the append-only audit trail (the database itself refuses UPDATE, DELETE and TRUNCATE on it).
import type { Migration } from "../migrate";

export const up: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE EXTENSION IF NOT EXISTS pgcrypto;

    CREATE TABLE users (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      email text NOT NULL,
      name text NOT NULL,
      password_hash text NOT NULL,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE UNIQUE INDEX users_email_unique ON users (lower(email));

    CREATE TABLE teams (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      name text NOT NULL UNIQUE,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TYPE team_role AS ENUM ('chemist', 'supervisor', 'lab_lead');

    CREATE TABLE memberships (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      role team_role NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (user_id, team_id)
    );
    CREATE INDEX memberships_team ON memberships (team_id);

    CREATE TABLE invitations (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      email text NOT NULL,
      role team_role NOT NULL,
      token_hash text NOT NULL UNIQUE,
      invited_by_id uuid NOT NULL REFERENCES users(id),
      expires_at timestamptz NOT NULL,
      accepted_at timestamptz,
      revoked_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX invitations_team ON invitations (team_id);

    CREATE TABLE password_reset_tokens (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      token_hash text NOT NULL UNIQUE,
      expires_at timestamptz NOT NULL,
      used_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE access_tokens (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      name text NOT NULL,
      token_hash text NOT NULL UNIQUE,
      token_prefix text NOT NULL,
      last_used_at timestamptz,
      revoked_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX access_tokens_user ON access_tokens (user_id);

    CREATE TABLE sign_in_attempts (
      id bigserial PRIMARY KEY,
      email text NOT NULL,
      address text NOT NULL,
      succeeded boolean NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX sign_in_attempts_email ON sign_in_attempts (lower(email), created_at);
    CREATE INDEX sign_in_attempts_address ON sign_in_attempts (address, created_at);

    CREATE TABLE audit_events (
      id bigserial PRIMARY KEY,
      actor_id uuid REFERENCES users(id),
      team_id uuid REFERENCES teams(id),
      action text NOT NULL,
      entity text NOT NULL,
      entity_id text,
      before jsonb,
      after jsonb,
      reason text,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX audit_events_team_time ON audit_events (team_id, created_at DESC);
    CREATE INDEX audit_events_entity ON audit_events (entity, entity_id);

    CREATE FUNCTION audit_events_refuse_change() RETURNS trigger AS $$
    BEGIN
      RAISE EXCEPTION 'audit_events is append-only: % is not allowed', TG_OP;
    END;
    $$ LANGUAGE plpgsql;
    CREATE TRIGGER audit_events_no_update BEFORE UPDATE OR DELETE ON audit_events
      FOR EACH ROW EXECUTE FUNCTION audit_events_refuse_change();
    CREATE TRIGGER audit_events_no_truncate BEFORE TRUNCATE ON audit_events
      FOR EACH STATEMENT EXECUTE FUNCTION audit_events_refuse_change();
  `);
};

export const down: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP TABLE IF EXISTS audit_events, sign_in_attempts, access_tokens, password_reset_tokens,
      invitations, memberships, teams, users CASCADE;
    DROP FUNCTION IF EXISTS audit_events_refuse_change();
    DROP TYPE IF EXISTS team_role;
  `);
};
