// The hot reads issue a fixed number of statements whatever the number of runs they cover: a run's
// record, a notebook's run list and a notebook's calls CSV; and the hot routes send no statement that
// reads more than their answer needs (a notes save reads no analysis, a page of lines counts no whole
// release). Counted and read in-process through Sequelize's query hooks on the app's own services,
// against the seeded demo lab (no timing is asserted).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Actor } from "@/lib/auth/actor";
import { closeDb, db, userIdByEmail } from "./support/database";
import { DEMO } from "./support/accounts";

type Services = {
  loadActor: typeof import("@/lib/services/accounts").loadActor;
  fetchRun: typeof import("@/lib/services/runs").fetchRun;
  fetchNotebookRuns: typeof import("@/lib/services/notebooks").fetchNotebookRuns;
  notebookCallsCsv: typeof import("@/lib/services/run-reports").notebookCallsCsv;
  updateRunNotes: typeof import("@/lib/services/runs").updateRunNotes;
  fetchLines: typeof import("@/lib/services/line-library-reads").fetchLines;
};

let services: Services;
let sequelize: typeof import("@/models").sequelize;
let chemist: Actor;
/** Notebooks made for this test: one run, then four. */
let notebooks: { id: string; runs: number; runIds: string[] }[];

/** Statements the work sends to PostgreSQL through the app's Sequelize instance. */
async function statementsOf(work: () => Promise<unknown>): Promise<number> {
  let count = 0;
  sequelize.addHook("beforeQuery", "count-statements", () => {
    count++;
  });
  try {
    await work();
  } finally {
    sequelize.removeHook("beforeQuery", "count-statements");
  }
  return count;
}

/** The SQL text of every statement the work sends, in order. */
async function sqlOf(work: () => Promise<unknown>): Promise<string[]> {
  const sql: string[] = [];
  sequelize.addHook("afterQuery", "read-statements", (_options, query) => {
    sql.push(String((query as { sql?: unknown }).sql));
  });
  try {
    await work();
  } finally {
    sequelize.removeHook("afterQuery", "read-statements");
  }
  return sql;
}

beforeAll(async () => {
  const models = await import("@/models");
  sequelize = models.sequelize;
  services = {
    loadActor: (await import("@/lib/services/accounts")).loadActor,
    fetchRun: (await import("@/lib/services/runs")).fetchRun,
    fetchNotebookRuns: (await import("@/lib/services/notebooks")).fetchNotebookRuns,
    notebookCallsCsv: (await import("@/lib/services/run-reports")).notebookCallsCsv,
    updateRunNotes: (await import("@/lib/services/runs")).updateRunNotes,
    fetchLines: (await import("@/lib/services/line-library-reads")).fetchLines,
  };
  const actor = await services.loadActor(await userIdByEmail(DEMO.chemist.email));
  if (!actor)
    throw new Error("the demo chemist is missing: run the tests through scripts/test.mjs");
  chemist = actor;
  // Two notebooks of the chemist's team made here, with one and with four copies of a seeded run
  // (rows put in directly: the counts, not the analysis, are under test; runs are never deleted).
  const { rows: seeded } = await db().query<{ id: string; team_id: string }>(
    `SELECT id, team_id FROM runs WHERE team_id = ANY($1::uuid[]) ORDER BY created_at LIMIT 1`,
    [chemist.memberships.map((m) => m.teamId)],
  );
  if (!seeded[0])
    throw new Error("the demo lab has no run: run the tests through scripts/test.mjs");
  notebooks = [];
  for (const runs of [1, 4]) {
    const { rows } = await db().query<{ id: string }>(
      `INSERT INTO notebooks (team_id, title, created_by_id) VALUES ($1, $2, $3) RETURNING id`,
      [
        seeded[0].team_id,
        `Statement counts, ${runs} run(s) ${Date.now().toString(36)}`,
        chemist.id,
      ],
    );
    const runIds: string[] = [];
    for (let k = 0; k < runs; k++) {
      const copy = await db().query<{ id: string }>(
        `INSERT INTO runs
         SELECT (jsonb_populate_record(NULL::runs, to_jsonb(r) || jsonb_build_object(
                  'id', gen_random_uuid(), 'notebook_id', $2::uuid, 'amends_run_id', NULL,
                  'rerun_of_id', NULL, 'status', 'draft', 'submitted_at', NULL, 'signed_at', NULL))).*
           FROM runs r WHERE r.id = $1
         RETURNING id`,
        [seeded[0].id, rows[0].id],
      );
      runIds.push(copy.rows[0].id);
    }
    notebooks.push({ id: rows[0].id, runs, runIds });
  }
});

afterAll(async () => {
  await sequelize.close();
  await closeDb();
});

describe("statements per hot read", () => {
  it("reads a run's record in three statements (the run, its overrides, its release)", async () => {
    for (const runId of notebooks.flatMap((n) => n.runIds)) {
      expect(await statementsOf(() => services.fetchRun(chemist, runId))).toBe(3);
    }
  });

  it("lists a notebook's runs and writes its calls CSV in as many statements for many runs as for one", async () => {
    const [fewest, most] = notebooks;
    const list = async (id: string) => statementsOf(() => services.fetchNotebookRuns(chemist, id));
    const csv = async (id: string) => statementsOf(() => services.notebookCallsCsv(chemist, id));
    expect(await list(most.id)).toBe(await list(fewest.id));
    expect(await csv(most.id)).toBe(await csv(fewest.id));
    // The notebook, its runs, their overrides and releases, spectra, instruments and authors.
    expect(await csv(most.id)).toBeLessThanOrEqual(7);
  });

  it("saves a run's notes reading only the workflow's columns, and answers the notes' record alone", async () => {
    const runId = notebooks[0].runIds[0];
    const { rows } = await db().query<{ lock_version: number; created_by_id: string }>(
      "SELECT lock_version, created_by_id FROM runs WHERE id = $1",
      [runId],
    );
    expect(rows[0].created_by_id).toBe(chemist.id);
    let saved: Awaited<ReturnType<Services["updateRunNotes"]>> | undefined;
    const sql = await sqlOf(async () => {
      saved = await services.updateRunNotes(chemist, runId, {
        notes: `Statement read ${Date.now().toString(36)}`,
        lockVersion: rows[0].lock_version,
      });
    });
    const reads = sql.filter((text) => /^SELECT .* FROM "runs"/s.test(text));
    expect(reads).toHaveLength(1);
    // The analysis (calls, peaks, candidate matches…) is hundreds of kilobytes against a large table:
    // the save reads exactly the columns it checks and writes.
    const columns = [...reads[0].replace(/ FROM .*/s, "").matchAll(/"(\w+)"(?: AS "\w+")?/g)]
      .map((m) => m[1])
      .sort();
    expect(columns).toEqual(
      ["created_by_id", "id", "lock_version", "notes", "status", "team_id", "updated_at"].sort(),
    );
    expect(Object.keys(saved!).sort()).toEqual(["id", "lockVersion", "notes", "updatedAt"]);
    expect(saved!.lockVersion).toBe(rows[0].lock_version + 1);
  });

  it("reads a page of lines without counting the whole release", async () => {
    const { RELEASE_LINE_COUNT } = await import("@/lib/services/line-library-rows");
    const teamId = chemist.memberships[0].teamId;
    let total = 0;
    const sql = await sqlOf(async () => {
      total = (await services.fetchLines(chemist, { teamId, minNm: 580, maxNm: 600 })).total;
    });
    expect(total).toBeGreaterThan(0);
    // No count over a release's lines that is not bounded by the page's own filter.
    const wholeRelease =
      /count\(\*\)\s+FROM\s+lines\s+\w+\s+WHERE\s+\w+\.release_id\s*=\s*\w+\.id/i;
    expect(wholeRelease.test(RELEASE_LINE_COUNT)).toBe(true);
    expect(sql.some((text) => wholeRelease.test(text))).toBe(false);
    // The summaries that show the count still carry it.
    const { fetchReleases } = await import("@/lib/services/line-library-reads");
    const counted = await sqlOf(() => fetchReleases(chemist, teamId));
    expect(counted.some((text) => wholeRelease.test(text))).toBe(true);
  });
});
