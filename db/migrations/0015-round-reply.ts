// A review round keeps the author's reply to the previous round's comments, and a returned round the
// SHA-256 of the run's content when it was returned, so that a returned run resubmitted with neither
// a change nor a reply can be refused (issue 14, item 8).
import type { Migration } from "../migrate";

export const up: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE run_rounds
      ADD COLUMN reply text NOT NULL DEFAULT '',
      ADD COLUMN decided_content_hash text CHECK (decided_content_hash ~ '^[0-9a-f]{64}$');
  `);
};

export const down: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE run_rounds
      DROP COLUMN IF EXISTS decided_content_hash,
      DROP COLUMN IF EXISTS reply;
  `);
};
