// `npm run bench`: median time of the line library's range query (the page and its count, the same
// SQL as fetchLines) on a 300,000-row published release, in a throwaway database that is dropped after.
import { Client } from "pg";
import { Sequelize } from "sequelize";
import pg from "pg";
import { migrator } from "../db/migrate";
import { lineQuerySql } from "../lib/services/line-library-rows";
import type { LineQuery } from "../lib/services/line-library-types";

const ROWS = 300_000;
const RUNS = 50;
const TARGET_MS = 20;
const json = process.argv.includes("--json");
const baseUrl =
  process.env.DATABASE_URL ??
  `postgres://postgres@127.0.0.1:${process.env.EMBERLINE_PG_PORT ?? 54329}/postgres`;
const benchDb = `emberline_bench_${process.pid}`;

function median(values: number[]): number {
  const sorted = values.slice().sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

function urlFor(database: string): string {
  const url = new URL(baseUrl);
  url.pathname = `/${database}`;
  return url.toString();
}

/** A team and a release of ROWS lines spread over 200–1000 nm, built in SQL and then published. */
async function buildRelease(client: Client): Promise<string> {
  const { rows: teams } = await client.query<{ id: string }>(
    "INSERT INTO teams (name) VALUES ('Bench team') RETURNING id",
  );
  const { rows: releases } = await client.query<{ id: string }>(
    "INSERT INTO line_releases (team_id) VALUES ($1) RETURNING id",
    [teams[0].id],
  );
  const releaseId = releases[0].id;
  // Deterministic pseudo-random wavelengths and species (no Math.random: same table every run).
  await client.query(
    `INSERT INTO lines (release_id, species, element, ion_stage, air_nm, vacuum_nm, intensity_arc, source)
     SELECT $1, s.symbol || ' I', s.symbol, 1, w.air, w.air * 1.000277, (i::bigint * 7919) % 1000, 'bench, synthetic'
       FROM generate_series(1, $2::int) AS i
       CROSS JOIN LATERAL (SELECT 200 + 800 * ((i::bigint * 2654435761) % 4294967296) / 4294967296.0 AS air) w
       CROSS JOIN LATERAL (SELECT (ARRAY['Fe','Ti','Cr','Mn','Co','Ni','V','Ca','Na','K'])[1 + i % 10] AS symbol) s`,
    [releaseId, ROWS],
  );
  await client.query(
    "UPDATE line_releases SET status = 'published', number = 1, published_at = now() WHERE id = $1",
    [releaseId],
  );
  // A published release never changes, so autovacuum marks it all-visible; do that now.
  await client.query("VACUUM ANALYZE lines");
  return releaseId;
}

async function timeQuery(
  client: Client,
  releaseId: string,
  query: LineQuery,
): Promise<{ medianMs: number; total: number }> {
  const sql = lineQuerySql(releaseId, query, 1, 100);
  let total = 0;
  const run = async () => {
    const [, counted] = await Promise.all([
      client.query(sql.select, sql.bind),
      client.query(sql.count, sql.bind),
    ]);
    total = Number(counted.rows[0].total);
  };
  await run(); // warm-up: plans and buffers
  const samples: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    const start = process.hrtime.bigint();
    await run();
    samples.push(Number(process.hrtime.bigint() - start) / 1e6);
  }
  return { medianMs: median(samples), total };
}

async function main(): Promise<void> {
  const admin = new Client({ connectionString: urlFor("postgres") });
  await admin.connect();
  await admin.query(`CREATE DATABASE ${benchDb}`);
  try {
    const sequelize = new Sequelize(urlFor(benchDb), {
      dialect: "postgres",
      dialectModule: pg,
      logging: false,
    });
    await migrator(sequelize).up();
    await sequelize.close();
    const client = new Client({ connectionString: urlFor(benchDb) });
    await client.connect();
    try {
      const buildStart = Date.now();
      const releaseId = await buildRelease(client);
      const buildMs = Date.now() - buildStart;
      const cases: { name: string; query: LineQuery }[] = [
        { name: "2 nm window (588–590 nm)", query: { teamId: "", minNm: 588, maxNm: 590 } },
        { name: "50 nm window (500–550 nm)", query: { teamId: "", minNm: 500, maxNm: 550 } },
        {
          name: "50 nm window, one species",
          query: { teamId: "", minNm: 500, maxNm: 550, species: "Fe I" },
        },
      ];
      const results = [];
      for (const { name, query } of cases)
        results.push({ name, rows: ROWS, ...(await timeQuery(client, releaseId, query)) });
      if (json) {
        process.stdout.write(`${JSON.stringify({ buildMs, targetMs: TARGET_MS, results })}\n`);
      } else {
        process.stdout.write(
          `\nLine-table range query (first page of 100 + count, same SQL as fetchLines), ${ROWS.toLocaleString("en")} rows, median of ${RUNS} runs (table built in ${buildMs} ms):\n`,
        );
        process.stdout.write(
          `${"case".padEnd(32)}${"matching".padStart(10)}${"median ms".padStart(12)}  target < ${TARGET_MS} ms\n`,
        );
        for (const r of results) {
          process.stdout.write(
            `${r.name.padEnd(32)}${String(r.total).padStart(10)}${r.medianMs.toFixed(2).padStart(12)}  ${r.medianMs < TARGET_MS ? "ok" : "SLOW"}\n`,
          );
        }
      }
    } finally {
      await client.end();
    }
  } finally {
    await admin.query(`DROP DATABASE IF EXISTS ${benchDb} WITH (FORCE)`);
    await admin.end();
  }
}

main().catch((error) => {
  process.stderr.write(
    `[emberline] Line query bench failed: ${error instanceof Error ? error.stack : error}\n`,
  );
  process.exit(1);
});
