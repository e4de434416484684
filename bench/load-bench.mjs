// `npm run bench -- --load`: the production build under load on loopback. Starts its own database
// (emberline_load, seeded with the demo lab), the built app on its own port, signs in the demo
// people, and runs clients for a fixed time with mixed reads and writes — once without PDF reports
// and once with them in the mix — then prints per-route p50/p95/p99, throughput and errors, and
// reads' p95 with PDFs against without. Bounded in clients, time and requests; stops by itself.
//
// Options: --clients N (50), --seconds S (30), --pdf-share F (0.05: share of requests that download a
// PDF report of a draft run, rendered every time), --build (run `next build` first; otherwise the
// existing .next is used when there is one), --json. Port: EMBERLINE_LOAD_PORT (3900).
import fs from "node:fs";
import path from "node:path";
import { spawnSync } from "node:child_process";
import {
  bootstrap,
  log,
  root,
  startChild,
  stopChildren,
  waitForPort,
} from "../scripts/bootstrap.mjs";

const args = process.argv.slice(2);
const option = (name, fallback) => {
  const i = args.indexOf(`--${name}`);
  return i >= 0 && args[i + 1] !== undefined ? Number(args[i + 1]) : fallback;
};
const CLIENTS = Math.min(200, Math.max(1, option("clients", 50)));
const SECONDS = Math.min(300, Math.max(1, option("seconds", 30)));
const PDF_SHARE = Math.min(0.5, Math.max(0, option("pdf-share", 0.05)));
/** A hard ceiling on requests per phase, whatever the speed: the bench never floods anything. */
const MAX_REQUESTS_PER_PHASE = 200_000;
const REQUEST_TIMEOUT_MS = 60_000;
const port = Number(process.env.EMBERLINE_LOAD_PORT ?? 3900);
const host = "127.0.0.1";
const APP_URL = `http://${host}:${port}`;
const DEMO_PASSWORD = "emberline-demo";

/** The mix (weights). Reads are GETs other than the PDF; writes change something. */
const MIX = [
  { route: "GET /api/me", weight: 20 },
  { route: "GET /api/lines (range)", weight: 15 },
  { route: "GET /api/notebooks", weight: 15 },
  { route: "GET /api/runs/:id", weight: 15 },
  { route: "GET /api/audit", weight: 10 },
  { route: "PATCH /api/runs/:id (notes)", weight: 10 },
  { route: "POST /api/notebooks", weight: 5 },
];
const PDF_ROUTE = "GET /api/runs/:id/report.pdf";

class Client {
  constructor() {
    this.cookie = "";
  }

  async request(method, urlPath, body) {
    const headers = { origin: APP_URL };
    if (this.cookie) headers.cookie = this.cookie;
    if (body !== undefined) headers["content-type"] = "application/json";
    const response = await fetch(`${APP_URL}${urlPath}`, {
      method,
      headers,
      body: body === undefined ? undefined : JSON.stringify(body),
      signal: AbortSignal.timeout(REQUEST_TIMEOUT_MS),
    });
    const cookie = response.headers.getSetCookie().find((c) => c.startsWith("emberline_session="));
    if (cookie) this.cookie = cookie.split(";")[0];
    const type = response.headers.get("content-type") ?? "";
    const payload = type.includes("json") ? await response.json() : await response.arrayBuffer();
    return {
      status: response.status,
      body: payload,
      retryAfter: response.headers.get("retry-after"),
    };
  }
}

async function signIn(email) {
  const client = new Client();
  const reply = await client.request("POST", "/api/session", { email, password: DEMO_PASSWORD });
  if (reply.status !== 200) throw new Error(`sign-in of ${email} answered ${reply.status}`);
  return { client, me: reply.body };
}

const quantile = (sorted, q) =>
  sorted.length ? sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))] : NaN;

/** Sets up what the clients read and write: the demo team's notebook, a run to read, one draft run per writer. */
async function prepare() {
  const chemist = await signIn("chem@demo.emberline.example");
  const lead = await signIn("lead@demo.emberline.example");
  const supervisor = await signIn("super@demo.emberline.example");
  const team = chemist.me.teams[0];
  const notebooks = await chemist.client.request("GET", `/api/notebooks?teamId=${team.id}`);
  const list = Array.isArray(notebooks.body) ? notebooks.body : (notebooks.body.notebooks ?? []);
  let seedRun;
  for (const notebook of list) {
    const runs = await chemist.client.request("GET", `/api/notebooks/${notebook.id}/runs`);
    const rows = Array.isArray(runs.body) ? runs.body : (runs.body.runs ?? []);
    if (rows.length) {
      seedRun = (await chemist.client.request("GET", `/api/runs/${rows[0].id}`)).body;
      break;
    }
  }
  if (!seedRun) throw new Error("the demo team has no run to read: seed the demo data first");
  const notebook = (
    await chemist.client.request("POST", "/api/notebooks", {
      teamId: team.id,
      title: `Load bench ${Date.now().toString(36)}`,
    })
  ).body;
  // Each writing client saves notes on its own draft run (no optimistic-lock races between clients).
  const ownRuns = [];
  for (let i = 0; i < CLIENTS; i++) {
    const reply = await chemist.client.request("POST", "/api/runs", {
      notebookId: notebook.id,
      spectrumId: seedRun.spectrumId,
      calibrationId: seedRun.calibrationId,
      source: seedRun.source,
    });
    if (reply.status !== 201)
      throw new Error(
        `creating a draft run answered ${reply.status}: ${JSON.stringify(reply.body)}`,
      );
    ownRuns.push({ id: reply.body.id, lockVersion: reply.body.lockVersion });
  }
  return { sessions: [chemist, lead, supervisor], teamId: team.id, seedRun, ownRuns };
}

async function phase(name, setup, withPdf) {
  const mix = withPdf
    ? [
        ...MIX,
        {
          route: PDF_ROUTE,
          weight: (PDF_SHARE / (1 - PDF_SHARE)) * MIX.reduce((s, m) => s + m.weight, 0),
        },
      ]
    : MIX;
  const total = mix.reduce((s, m) => s + m.weight, 0);
  const samples = new Map(mix.map((m) => [m.route, { ms: [], errors: 0, busy: 0, statuses: {} }]));
  let sent = 0;
  const started = performance.now();
  const deadline = started + SECONDS * 1000;
  let seed = 12345;
  const random = () => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648;

  const runOne = async (index) => {
    // The chemist's session for writes (the author of the draft runs); reads from any of the three.
    const chemist = setup.sessions[0].client;
    const reader = setup.sessions[index % setup.sessions.length].client;
    const own = setup.ownRuns[index];
    while (performance.now() < deadline && sent < MAX_REQUESTS_PER_PHASE) {
      sent += 1;
      let pick = random() * total;
      const { route } = mix.find((m) => (pick -= m.weight) < 0) ?? mix[0];
      const t0 = performance.now();
      let reply;
      try {
        switch (route) {
          case "GET /api/me":
            reply = await reader.request("GET", "/api/me");
            break;
          case "GET /api/lines (range)": {
            const min = 350 + Math.floor(random() * 400);
            reply = await reader.request(
              "GET",
              `/api/lines?teamId=${setup.teamId}&minNm=${min}&maxNm=${min + 25}`,
            );
            break;
          }
          case "GET /api/notebooks":
            reply = await reader.request("GET", `/api/notebooks?teamId=${setup.teamId}`);
            break;
          case "GET /api/runs/:id":
            reply = await reader.request("GET", `/api/runs/${setup.seedRun.id}`);
            break;
          case "GET /api/audit":
            reply = await reader.request("GET", `/api/audit?teamId=${setup.teamId}&limit=50`);
            break;
          case "PATCH /api/runs/:id (notes)":
            reply = await chemist.request("PATCH", `/api/runs/${own.id}`, {
              notes: `load ${sent}`,
              lockVersion: own.lockVersion,
            });
            if (reply.status === 200) own.lockVersion = reply.body.lockVersion;
            break;
          case "POST /api/notebooks":
            reply = await chemist.request("POST", "/api/notebooks", {
              teamId: setup.teamId,
              title: `Load ${name} ${sent}`,
            });
            break;
          case PDF_ROUTE:
            reply = await reader.request("GET", `/api/runs/${own.id}/report.pdf`);
            break;
        }
      } catch (error) {
        reply = { status: 0, error };
      }
      const sample = samples.get(route);
      sample.ms.push(performance.now() - t0);
      sample.statuses[reply.status] = (sample.statuses[reply.status] ?? 0) + 1;
      if (reply.status === 503 && reply.retryAfter) sample.busy += 1;
      else if (reply.status < 200 || reply.status >= 300) sample.errors += 1;
    }
  };
  await Promise.all(Array.from({ length: CLIENTS }, (_, i) => runOne(i)));
  const seconds = (performance.now() - started) / 1000;
  const routes = [...samples].map(([route, s]) => {
    const sorted = s.ms.sort((a, b) => a - b);
    return {
      route,
      count: sorted.length,
      p50: quantile(sorted, 0.5),
      p95: quantile(sorted, 0.95),
      p99: quantile(sorted, 0.99),
      errors: s.errors,
      busy503: s.busy,
      statuses: s.statuses,
    };
  });
  const reads = [...samples]
    .filter(([route]) => route.startsWith("GET") && route !== PDF_ROUTE)
    .flatMap(([, s]) => s.ms)
    .sort((a, b) => a - b);
  const writes = [...samples]
    .filter(([route]) => !route.startsWith("GET"))
    .flatMap(([, s]) => s.ms)
    .sort((a, b) => a - b);
  const count = routes.reduce((n, r) => n + r.count, 0);
  return {
    name,
    seconds,
    requests: count,
    throughput: count / seconds,
    errors: routes.reduce((n, r) => n + r.errors, 0),
    busy503: routes.reduce((n, r) => n + r.busy503, 0),
    readP95: quantile(reads, 0.95),
    writeP95: quantile(writes, 0.95),
    routes,
  };
}

function print(result) {
  const f = (ms) => (Number.isFinite(ms) ? ms.toFixed(0).padStart(7) : "      –");
  console.log(
    `\n${result.name}: ${result.requests} requests in ${result.seconds.toFixed(1)} s = ${result.throughput.toFixed(1)} req/s, errors ${result.errors}, busy (503 + Retry-After) ${result.busy503}`,
  );
  console.log(
    `${"route".padEnd(34)} ${"count".padStart(6)} ${"p50 ms".padStart(7)} ${"p95 ms".padStart(7)} ${"p99 ms".padStart(7)} errors`,
  );
  for (const r of result.routes)
    console.log(
      `${r.route.padEnd(34)} ${String(r.count).padStart(6)} ${f(r.p50)} ${f(r.p95)} ${f(r.p99)} ${r.errors}${r.errors ? ` ${JSON.stringify(r.statuses)}` : ""}`,
    );
  console.log(
    `${"reads (all GETs but the PDF)".padEnd(34)} ${"".padStart(6)} ${"".padStart(7)} ${f(result.readP95)}`,
  );
  console.log(`${"writes".padEnd(34)} ${"".padStart(6)} ${"".padStart(7)} ${f(result.writeP95)}`);
}

async function main() {
  const { env, stopCluster } = await bootstrap({
    database: process.env.EMBERLINE_LOAD_DB_NAME ?? "emberline_load",
    mailPort: Number(process.env.EMBERLINE_SMTP_PORT ?? 2525),
    mailDir: "mail-load",
  });
  const next = path.join(root, "node_modules", ".bin", "next");
  try {
    if (args.includes("--build") || !fs.existsSync(path.join(root, ".next", "BUILD_ID"))) {
      log("Building the app (next build)…");
      const build = spawnSync(next, ["build"], {
        cwd: root,
        stdio: "inherit",
        env: { ...env, NODE_ENV: "production" },
      });
      if (build.status !== 0) throw new Error("next build failed");
    }
    startChild(next, ["start", "-H", host, "-p", String(port)], {
      env: { ...env, APP_URL, NODE_ENV: "production" },
    });
    await waitForPort(port, 180_000, host);
    log(
      `Load bench: ${CLIENTS} clients × ${SECONDS} s per phase against ${APP_URL} (loopback only).`,
    );
    const setup = await prepare();
    // Warm-up: the first requests compile nothing in production, but the worker threads start on first use.
    await setup.sessions[0].client.request("GET", `/api/runs/${setup.ownRuns[0].id}/report.pdf`);
    const without = await phase("without PDFs", setup, false);
    print(without);
    const withPdf = await phase(
      `with PDFs (${(PDF_SHARE * 100).toFixed(0)} % of requests)`,
      setup,
      true,
    );
    print(withPdf);
    const ratio = withPdf.readP95 / without.readP95;
    console.log(
      `\nreads' p95 with PDFs ÷ without: ${ratio.toFixed(2)} (target ≤ 2); errors ${without.errors + withPdf.errors} (target 0)`,
    );
    if (args.includes("--json"))
      console.log(
        JSON.stringify({
          clients: CLIENTS,
          seconds: SECONDS,
          pdfShare: PDF_SHARE,
          without,
          withPdf,
          ratio,
        }),
      );
  } finally {
    stopChildren();
    stopCluster();
  }
}

main().catch((error) => {
  console.error(error);
  stopChildren();
  process.exit(1);
});
