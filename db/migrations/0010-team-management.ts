// Team management: a record of every removal from a team, so that sessions and access tokens issued
// before it are told (401) rather than shown "not found" when they reach for the team's records, and
// a guard that a team with members always keeps at least one lab lead, whatever path changes them.
import type { Migration } from "../migrate";

export const up: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TABLE membership_removals (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      role team_role NOT NULL,
      removed_by_id uuid NOT NULL REFERENCES users(id),
      removed_at timestamptz NOT NULL DEFAULT now()
    );
    -- Read on every request of a signed-in person: their removals after the credential was issued.
    CREATE INDEX membership_removals_user ON membership_removals (user_id, removed_at);

    -- Deferred to the commit, so that a transaction may promote one member and demote another in
    -- any order. It locks the team's row first: of two transactions demoting the team's last two
    -- lab leads, the second waits for the first's commit and then sees that no lab lead is left.
    CREATE FUNCTION memberships_keep_a_lab_lead() RETURNS trigger AS $$
    BEGIN
      IF OLD.role <> 'lab_lead' THEN
        RETURN NULL;
      END IF;
      PERFORM 1 FROM teams WHERE id = OLD.team_id FOR UPDATE;
      IF EXISTS (SELECT 1 FROM memberships WHERE team_id = OLD.team_id)
         AND NOT EXISTS (SELECT 1 FROM memberships WHERE team_id = OLD.team_id AND role = 'lab_lead') THEN
        RAISE EXCEPTION 'a team with members keeps at least one lab lead (team %)', OLD.team_id
          USING ERRCODE = 'check_violation';
      END IF;
      RETURN NULL;
    END;
    $$ LANGUAGE plpgsql;
    CREATE CONSTRAINT TRIGGER memberships_keep_a_lab_lead AFTER UPDATE OR DELETE ON memberships
      DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION memberships_keep_a_lab_lead();
  `);
};

export const down: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP TRIGGER IF EXISTS memberships_keep_a_lab_lead ON memberships;
    DROP FUNCTION IF EXISTS memberships_keep_a_lab_lead();
    DROP TABLE IF EXISTS membership_removals;
  `);
};
