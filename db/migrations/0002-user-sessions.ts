// Server-side session records, so that sign-out, a password reset or a password change can end a
// session even when someone kept a copy of its cookie.
import type { Migration } from "../migrate";

export const up: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TABLE user_sessions (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      expires_at timestamptz NOT NULL,
      revoked_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX user_sessions_user ON user_sessions (user_id) WHERE revoked_at IS NULL;
  `);
};

export const down: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`DROP TABLE IF EXISTS user_sessions`);
};
