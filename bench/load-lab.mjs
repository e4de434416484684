// The load bench's realistic lab: tops the demo team up to a busy lab's volume (instruments, spectra,
// runs in notebooks, a 300,000-line release, a long audit trail) by copying the demo's own rows in
// SQL, so that the routes under load read tables of a real size. Runs once per database: later runs
// of the bench find the counts reached and add nothing. Bench data only; never used by the app.
import pg from "pg";

/** The volume of the lab (issue: 10 instruments, 2,000 spectra, 5,000 runs, 300,000 lines, 100,000 audit events). */
export const LAB = {
  instruments: 10,
  spectra: 2_000,
  notebooks: 250,
  runs: 5_000,
  lines: 300_000,
  auditEvents: 100_000,
};

const ELEMENTS = (
  "Ag Al Ar As Au B Ba Be Bi C Ca Cd Ce Co Cr Cs Cu Dy Er Eu Fe Ga Gd Ge H He Hf Hg Ho In Ir K Kr La " +
  "Li Lu Mg Mn Mo N Na Nb Nd Ne Ni O Os P Pb Pd Pr Pt Rb Re Rh Ru S Sb Sc Se Si Sm Sn Sr Ta Tb Te Ti " +
  "Tl Tm V W Xe Y Yb Zn Zr"
).split(" ");

async function count(client, sql, params) {
  const { rows } = await client.query(sql, params);
  return Number(rows[0].n);
}

/** Copies `times` rows of `table` chosen round-robin from `sourceSql`, with some columns overridden by SQL expressions. */
async function copyRows(client, { table, sourceSql, params = [], times, overrides }) {
  if (times <= 0) return;
  const { rows } = await client.query(
    `SELECT column_name FROM information_schema.columns
      WHERE table_schema = 'public' AND table_name = $1 AND column_name <> 'id'
      ORDER BY ordinal_position`,
    [table],
  );
  const columns = rows.map((r) => r.column_name);
  const list = columns.map((c) => `"${c}"`).join(", ");
  const values = columns.map((c) => overrides[c] ?? `src."${c}"`).join(", ");
  await client.query(
    `WITH src_rows AS (SELECT row_number() OVER () - 1 AS k, s.* FROM (${sourceSql}) s),
          n AS (SELECT count(*) AS total FROM src_rows)
     INSERT INTO ${table} (${list})
     SELECT ${values}
       FROM generate_series(0, ${times - 1}) AS g(i)
       CROSS JOIN n
       JOIN src_rows src ON src.k = g.i % n.total`,
    params,
  );
}

/**
 * Tops up the team with the most runs to `LAB`'s volume. `url` is a superuser's connection to the
 * bench's database (the published release's lines are added with triggers set aside, as a seed would).
 */
export async function seedRealisticLab(url, log = () => {}) {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    const { rows: teams } = await client.query(
      "SELECT team_id FROM runs GROUP BY team_id ORDER BY count(*) DESC LIMIT 1",
    );
    if (!teams.length)
      throw new Error("the bench database has no runs to copy: seed the demo first");
    const teamId = teams[0].team_id;
    const started = Date.now();
    await client.query("BEGIN");

    const instruments = await count(
      client,
      "SELECT count(*) n FROM instruments WHERE team_id = $1",
      [teamId],
    );
    await copyRows(client, {
      table: "instruments",
      sourceSql: "SELECT * FROM instruments WHERE team_id = $1 ORDER BY created_at",
      params: [teamId],
      times: LAB.instruments - instruments,
      overrides: { name: `src.name || ' (bench ' || (g.i + 1) || ')'` },
    });

    const spectra = await count(
      client,
      "SELECT count(*) n FROM spectrum_files WHERE team_id = $1",
      [teamId],
    );
    // Copies stay on their source's instrument (its calibrations fit them), dated over the last year.
    await copyRows(client, {
      table: "spectrum_files",
      sourceSql:
        "SELECT * FROM spectrum_files WHERE team_id = $1 AND kind = 'sample' ORDER BY created_at",
      params: [teamId],
      times: LAB.spectra - spectra,
      overrides: {
        label: `src.label || ' #' || (g.i + 1)`,
        created_at: `now() - (g.i % 365) * interval '1 day'`,
      },
    });

    const notebooks = await count(client, "SELECT count(*) n FROM notebooks WHERE team_id = $1", [
      teamId,
    ]);
    await copyRows(client, {
      table: "notebooks",
      sourceSql: "SELECT * FROM notebooks WHERE team_id = $1 ORDER BY created_at LIMIT 1",
      params: [teamId],
      times: LAB.notebooks - notebooks,
      overrides: {
        title: `'Bench notebook ' || (g.i + 1)`,
        created_at: `now() - (g.i % 365) * interval '1 day'`,
      },
    });

    // Runs: the demo's analyses copied as drafts into the notebooks (each on its source's spectrum and calibration).
    const runs = await count(client, "SELECT count(*) n FROM runs WHERE team_id = $1", [teamId]);
    const toAdd = LAB.runs - runs;
    if (toAdd > 0) {
      await client.query(
        `CREATE TEMP TABLE bench_notebooks ON COMMIT DROP AS
           SELECT row_number() OVER (ORDER BY id) - 1 AS k, id FROM notebooks WHERE team_id = '${teamId}';
`,
      );
      const notebookCount = await count(client, "SELECT count(*) n FROM bench_notebooks");
      await copyRows(client, {
        table: "runs",
        sourceSql: `SELECT * FROM runs WHERE team_id = $1 AND amends_run_id IS NULL AND rerun_of_id IS NULL
                     ORDER BY created_at`,
        params: [teamId],
        times: toAdd,
        overrides: {
          notebook_id: `(SELECT id FROM bench_notebooks WHERE k = g.i % ${notebookCount})`,
          status: `'draft'`,
          version_number: "1",
          review_round: "0",
          requested_reviewer_id: "NULL",
          submitted_at: "NULL",
          signed_at: "NULL",
          lock_version: "0",
          created_at: `now() - (g.i % 365) * interval '1 day'`,
        },
      });
    }

    // Lines: the team's published release grows to LAB.lines (deterministic wavelengths and species).
    const { rows: releases } = await client.query(
      "SELECT id FROM line_releases WHERE team_id = $1 AND status = 'published' ORDER BY number DESC LIMIT 1",
      [teamId],
    );
    const lines = await count(client, "SELECT count(*) n FROM lines WHERE release_id = $1", [
      releases[0].id,
    ]);
    if (LAB.lines - lines > 0) {
      // A published release refuses new lines by trigger; a seed sets that aside for its own session.
      await client.query("SET LOCAL session_replication_role = replica");
      await client.query(
        `INSERT INTO lines (release_id, species, element, ion_stage, air_nm, vacuum_nm, uncertainty_nm,
                            intensity_flame, intensity_arc, intensity_spark, source)
         SELECT $1, e.symbol || CASE WHEN i % 3 = 0 THEN ' II' ELSE ' I' END, e.symbol,
                CASE WHEN i % 3 = 0 THEN 2 ELSE 1 END, w.air, w.air * 1.000277, 0.001,
                (i::bigint * 7919) % 1000, (i::bigint * 104729) % 1000, (i::bigint * 1299709) % 1000,
                'load bench, synthetic'
           FROM generate_series(1, $2::int) AS i
           CROSS JOIN LATERAL (SELECT 200 + 800 * ((i::bigint * 2654435761) % 4294967296) / 4294967296.0 AS air) w
           CROSS JOIN LATERAL (SELECT ($3::text[])[1 + i % ${ELEMENTS.length}] AS symbol) e`,
        [releases[0].id, LAB.lines - lines, ELEMENTS],
      );
      await client.query("SET LOCAL session_replication_role = origin");
    }

    // Audit: events in the team's chain (the chain trigger hashes each one, as for the app's own).
    const events = await count(client, "SELECT count(*) n FROM audit_events WHERE team_id = $1", [
      teamId,
    ]);
    if (LAB.auditEvents - events > 0) {
      await client.query(
        `INSERT INTO audit_events (actor_id, team_id, action, entity, entity_id, after, created_at)
         SELECT (SELECT user_id FROM memberships WHERE team_id = $1 ORDER BY user_id
                  OFFSET (i % (SELECT count(*) FROM memberships WHERE team_id = $1)) LIMIT 1),
                $1, (ARRAY['run.update', 'run.create', 'spectrum.upload', 'notebook.create'])[1 + i % 4],
                'run', gen_random_uuid()::text, jsonb_build_object('notes', 'bench ' || i),
                now() - interval '1 year' + i * interval '5 minutes'
           FROM generate_series(1, $2::int) AS i`,
        [teamId, LAB.auditEvents - events],
      );
    }
    await client.query("COMMIT");
    // The steady state of a lab, whose autovacuum has long passed over its tables: without the
    // visibility map a count over a release reads every heap page it touches (the line range's count,
    // 9,382 of 300,000 lines, took 85 ms instead of 1.7 ms by the index alone).
    await client.query("VACUUM (ANALYZE)");
    log(
      `Realistic lab: ${LAB.instruments} instruments, ${LAB.spectra} spectra, ${LAB.runs} runs, ` +
        `${LAB.lines} lines, ${LAB.auditEvents} audit events in the busiest team (${((Date.now() - started) / 1000).toFixed(0)} s to top up).`,
    );
    return teamId;
  } catch (error) {
    await client.query("ROLLBACK").catch(() => {});
    throw error;
  } finally {
    await client.end();
  }
}
