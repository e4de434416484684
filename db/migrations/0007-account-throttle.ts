// Throttling that slows an attacker without locking the owner out: sign_in_attempts also records
// password-reset requests and mails and the unlock a completed reset gives, told apart by `kind`
// (a column rather than a new table, so the application role's grants on the table cover it).
import type { Migration } from "../migrate";

export const up: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE sign_in_attempts ADD COLUMN kind text NOT NULL DEFAULT 'password'
      CHECK (kind IN ('password', 'reset_request', 'reset_mail', 'unlock'));
    CREATE INDEX sign_in_attempts_pair ON sign_in_attempts (email, address, kind, created_at);
    CREATE INDEX sign_in_attempts_kind_email ON sign_in_attempts (kind, email, created_at);
    CREATE INDEX sign_in_attempts_kind_address ON sign_in_attempts (kind, address, created_at);
  `);
};

export const down: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP INDEX IF EXISTS sign_in_attempts_pair, sign_in_attempts_kind_email, sign_in_attempts_kind_address;
    ALTER TABLE sign_in_attempts DROP COLUMN IF EXISTS kind;
  `);
};
