// A verified line names what it was checked against: the citation of the reference line that agreed
// with it (a reference check), or nothing for a lab lead's check against the row's own source.
import type { Migration } from "../migrate";

export const up: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE lines
      ADD COLUMN verified_citation text CHECK (char_length(verified_citation) BETWEEN 1 AND 500),
      ADD CONSTRAINT lines_verified_citation_of_verified
        CHECK (verified_citation IS NULL OR verified_at IS NOT NULL);
  `);
};

export const down: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE lines
      DROP CONSTRAINT IF EXISTS lines_verified_citation_of_verified,
      DROP COLUMN IF EXISTS verified_citation;
  `);
};
