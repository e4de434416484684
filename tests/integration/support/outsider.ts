// "A member of another team": a lab lead of a team that shares nothing with the demo teams,
// written straight into the database (the app has no way to create a team yet). Idempotent.
import argon2 from "argon2";
import { db } from "./database";

export const OUTSIDER = {
  email: "outsider@test.emberline.example",
  name: "Oda Outside",
  password: "outsider test password",
  teamName: "Outsider Test Bench",
} as const;

let ready: Promise<{ userId: string; teamId: string }> | undefined;

export function ensureOutsider(): Promise<{ userId: string; teamId: string }> {
  ready ??= createOutsider();
  return ready;
}

async function createOutsider(): Promise<{ userId: string; teamId: string }> {
  const passwordHash = await argon2.hash(OUTSIDER.password, { type: argon2.argon2id });
  const client = await db().connect();
  try {
    await client.query("BEGIN");
    const team = await client.query<{ id: string }>(
      `INSERT INTO teams (name) VALUES ($1)
       ON CONFLICT (name) DO UPDATE SET name = EXCLUDED.name RETURNING id`,
      [OUTSIDER.teamName],
    );
    // users has a unique index on lower(email), not a constraint, hence the explicit lookup.
    let user = await client.query<{ id: string }>(
      "SELECT id FROM users WHERE lower(email) = lower($1)",
      [OUTSIDER.email],
    );
    if (!user.rows[0]) {
      user = await client.query<{ id: string }>(
        "INSERT INTO users (email, name, password_hash) VALUES ($1, $2, $3) RETURNING id",
        [OUTSIDER.email, OUTSIDER.name, passwordHash],
      );
    } else {
      await client.query("UPDATE users SET password_hash = $2 WHERE id = $1", [
        user.rows[0].id,
        passwordHash,
      ]);
    }
    const ids = { userId: user.rows[0].id, teamId: team.rows[0].id };
    await client.query(
      `INSERT INTO memberships (user_id, team_id, role) VALUES ($1, $2, 'lab_lead')
       ON CONFLICT (user_id, team_id) DO NOTHING`,
      [ids.userId, ids.teamId],
    );
    await client.query("COMMIT");
    return ids;
  } catch (error) {
    await client.query("ROLLBACK");
    throw error;
  } finally {
    client.release();
  }
}
