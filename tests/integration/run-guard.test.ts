// The database's own guard on runs: the analysis columns are refused in any UPDATE by name (cheap
// whatever the size of the stored candidate lines), workflow columns may change until the run is
// signed, and no column of runs is left unguarded by accident when one is added.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { PoolClient } from "pg";
import { db } from "./support/database";

/** The columns the review workflow changes; every other column of runs is the analysis's record. */
const WORKFLOW_COLUMNS = [
  "lock_version",
  "notes",
  "requested_reviewer_id",
  "review_round",
  "signed_at",
  "status",
  "submitted_at",
  "updated_at",
];

let client: PoolClient;
let draftId: string;

beforeAll(async () => {
  client = await db().connect();
  const { rows } = await client.query<{ id: string }>(
    "SELECT id FROM runs WHERE status = 'draft' ORDER BY created_at LIMIT 1",
  );
  expect(rows.length, "the demo data has a draft run").toBe(1);
  draftId = rows[0].id;
});

afterAll(() => client.release());

/** Runs `sql` in a transaction that is always rolled back: the demo data stays as it was. */
async function attempt(sql: string): Promise<void> {
  await client.query("BEGIN");
  try {
    await client.query(sql, [draftId]);
  } finally {
    await client.query("ROLLBACK");
  }
}

describe("the runs guard", () => {
  it("lists every column of runs that is not the workflow's", async () => {
    const { rows: columns } = await client.query<{ name: string }>(
      `SELECT column_name AS name FROM information_schema.columns
        WHERE table_schema = 'public' AND table_name = 'runs'`,
    );
    const { rows: guarded } = await client.query<{ name: string }>(
      `SELECT a.attname AS name FROM pg_trigger t
         JOIN pg_attribute a ON a.attrelid = t.tgrelid AND a.attnum = ANY (t.tgattr)
        WHERE t.tgname = 'runs_analysis_frozen'`,
    );
    const expected = columns
      .map((c) => c.name)
      .filter((name) => !WORKFLOW_COLUMNS.includes(name))
      .sort();
    expect(guarded.map((g) => g.name).sort()).toEqual(expected);
    expect(expected).toContain("matches");
  });

  it("refuses an analysis column in an UPDATE, changed or not", async () => {
    await expect(attempt("UPDATE runs SET calls = '[]' WHERE id = $1")).rejects.toThrow(
      /analysis of a run is a record and cannot be changed/,
    );
    await expect(attempt("UPDATE runs SET matches = matches WHERE id = $1")).rejects.toThrow(
      /cannot be changed/,
    );
    await expect(
      attempt("UPDATE runs SET notes = 'x', noise_counts = noise_counts + 1 WHERE id = $1"),
    ).rejects.toThrow(/cannot be changed/);
  });

  it("lets a draft's workflow columns change", async () => {
    await expect(
      attempt(
        "UPDATE runs SET notes = 'guard test', lock_version = lock_version + 1 WHERE id = $1",
      ),
    ).resolves.toBeUndefined();
  });
});
