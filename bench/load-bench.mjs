// `npm run bench -- --load`: the production build under load on loopback. Starts its own database
// (emberline_load: the demo lab topped up to a busy lab's volume by bench/load-lab.mjs), the built
// app on its own port (or several instances on one database), signs in the demo people, has each writing
// client analyse the same flame sample against the lab's release (the first flame run of the notebooks in
// title order, so every run of the bench reads records of one size), measures each route's CPU per
// request (app and PostgreSQL) with one client, then runs clients for a fixed time with mixed reads
// and writes — once without PDF reports and once with them in the mix — and prints per-route
// p50/p95/p99, throughput, errors, CPU per request, and reads' p95 with PDFs against without. Bounded in clients, time and requests; loopback only; stops by itself.
//
// Options: --clients N (50), --seconds S (30), --pdf-share F (0.05: share of requests that download a
// PDF report of a draft run, rendered every time), --instances K (1: K app instances on one database,
// clients spread over them in turn, as behind a round-robin balancer), --demo-only (skip the realistic
// lab's volume), --build (run `next build` first; otherwise the existing .next is used when there is
// one), --keep-lab (reuse the last run's database: faster, but its notebooks and runs grow with every
// run's writes, so its figures do not compare with a fresh lab's; a database whose name does not end
// in "_load" is always kept), --json. Ports: EMBERLINE_LOAD_PORT (3900) and the ones after it.
import fs from "node:fs";
import path from "node:path";
import { spawnSync } from "node:child_process";
import { seedRealisticLab } from "./load-lab.mjs";
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
const INSTANCES = Math.min(4, Math.max(1, option("instances", 1)));
/** Sequential requests per route when measuring CPU per request with one client. */
const CPU_SAMPLES = 60;
/** A hard ceiling on requests per phase, whatever the speed: the bench never floods anything. */
const MAX_REQUESTS_PER_PHASE = 200_000;
const REQUEST_TIMEOUT_MS = 60_000;
const port = Number(process.env.EMBERLINE_LOAD_PORT ?? 3900);
const host = "127.0.0.1";
const APP_URL = `http://${host}:${port}`;
const APP_URLS = Array.from({ length: INSTANCES }, (_, i) => `http://${host}:${port + i}`);
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

  /** `base`: the app instance to ask (sessions live in the database, so any instance knows the cookie). */
  async request(method, urlPath, body, base = APP_URL) {
    const headers = { origin: base };
    if (this.cookie) headers.cookie = this.cookie;
    if (body !== undefined) headers["content-type"] = "application/json";
    const response = await fetch(`${base}${urlPath}`, {
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
  // The sample every client analyses and then reads is chosen the same way on every run of the bench:
  // the notebooks in title order, the first flame sample among each one's runs. Taking the most recently
  // active notebook's newest run, as the list comes, depended on which seeded row was written last: a
  // lamp read-back once (its record against the lab's table 73 KB), a flame sample another time (617 KB,
  // some 165 species weighed), and the two runs' figures differed threefold.
  const byTitle = [...list].sort(
    (a, b) => a.title.localeCompare(b.title) || a.id.localeCompare(b.id),
  );
  let seedRun;
  for (const notebook of byTitle) {
    const runs = await chemist.client.request("GET", `/api/notebooks/${notebook.id}/runs`);
    const rows = Array.isArray(runs.body) ? runs.body : (runs.body.runs ?? []);
    const flame = rows.find((row) => row.source === "flame");
    if (flame) {
      seedRun = (await chemist.client.request("GET", `/api/runs/${flame.id}`)).body;
      break;
    }
  }
  if (!seedRun) throw new Error("the demo team has no flame run to read: seed the demo data first");
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

let seed = 12345;
/** The bench's own deterministic generator (the same sequence of requests on every run). */
const random = () => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648;

/**
 * One request of `route` as client number `index` against the app instance `base`: reads from any of
 * the three demo people, writes by the chemist on the client's own draft run (no lock races).
 */
async function send(route, setup, index, base, tag) {
  const chemist = setup.sessions[0].client;
  const reader = setup.sessions[index % setup.sessions.length].client;
  const own = setup.ownRuns[index % setup.ownRuns.length];
  switch (route) {
    case "GET /api/me":
      return reader.request("GET", "/api/me", undefined, base);
    case "GET /api/lines (range)": {
      const min = 350 + Math.floor(random() * 400);
      const query = `teamId=${setup.teamId}&minNm=${min}&maxNm=${min + 25}`;
      return reader.request("GET", `/api/lines?${query}`, undefined, base);
    }
    case "GET /api/notebooks":
      return reader.request("GET", `/api/notebooks?teamId=${setup.teamId}`, undefined, base);
    case "GET /api/runs/:id":
      // A run analysed by this build against the lab's table (the seed run may be an old one).
      return reader.request("GET", `/api/runs/${own.id}`, undefined, base);
    case "GET /api/audit":
      return reader.request("GET", `/api/audit?teamId=${setup.teamId}&limit=50`, undefined, base);
    case "PATCH /api/runs/:id (notes)": {
      const body = { notes: `load ${tag}`, lockVersion: own.lockVersion };
      const reply = await chemist.request("PATCH", `/api/runs/${own.id}`, body, base);
      if (reply.status === 200) own.lockVersion = reply.body.lockVersion;
      return reply;
    }
    case "POST /api/notebooks":
      return chemist.request(
        "POST",
        "/api/notebooks",
        { teamId: setup.teamId, title: `Load ${tag}` },
        base,
      );
    case PDF_ROUTE:
      return reader.request("GET", `/api/runs/${own.id}/report.pdf`, undefined, base);
  }
  throw new Error(`unknown route ${route}`);
}

const CLOCK_TICKS_PER_S = 100; // Linux's USER_HZ, the unit of /proc/<pid>/stat's CPU times

/** CPU seconds of a process and its live descendants, plus what it has reaped of exited children. */
function treeCpuSeconds(rootPid) {
  const stats = new Map();
  for (const entry of fs.readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const text = fs.readFileSync(`/proc/${entry}/stat`, "utf8");
      // Fields after the command name (which may hold spaces) start at ")".
      const fields = text.slice(text.lastIndexOf(")") + 2).split(" ");
      stats.set(Number(entry), {
        ppid: Number(fields[1]),
        ticks: Number(fields[11]) + Number(fields[12]),
        reaped: Number(fields[13]) + Number(fields[14]),
      });
    } catch {
      // the process ended while being read
    }
  }
  const inTree = (pid) => {
    for (let p = pid, hops = 0; p > 1 && hops < 64; hops++) {
      if (p === rootPid) return true;
      p = stats.get(p)?.ppid ?? 0;
    }
    return false;
  };
  let ticks = stats.get(rootPid)?.reaped ?? 0;
  for (const [pid, s] of stats) if (inTree(pid)) ticks += s.ticks;
  return ticks / CLOCK_TICKS_PER_S;
}

/** CPU used by the app instances and by PostgreSQL between two calls. */
function cpuMeter(appPids, postmasterPid) {
  const read = () => ({
    app: appPids.reduce((sum, pid) => sum + treeCpuSeconds(pid), 0),
    db: treeCpuSeconds(postmasterPid),
  });
  const start = read();
  return () => {
    const end = read();
    return { appS: end.app - start.app, dbS: end.db - start.db };
  };
}

/** Each route alone, one client, CPU_SAMPLES requests in a row: CPU per request of the app and PostgreSQL. */
async function perRouteCpu(setup, cpu) {
  const rows = [];
  for (const { route } of [...MIX, { route: PDF_ROUTE }]) {
    const n = route === PDF_ROUTE ? Math.ceil(CPU_SAMPLES / 6) : CPU_SAMPLES;
    const ms = [];
    let errors = 0;
    const stop = cpu();
    for (let i = 0; i < n; i++) {
      const t0 = performance.now();
      const reply = await send(route, setup, 0, APP_URL, `cpu ${i}`);
      ms.push(performance.now() - t0);
      if (reply.status < 200 || reply.status >= 300) errors += 1;
    }
    const used = stop();
    ms.sort((a, b) => a - b);
    rows.push({
      route,
      count: n,
      p50: quantile(ms, 0.5),
      appMs: (used.appS * 1000) / n,
      dbMs: (used.dbS * 1000) / n,
      errors,
    });
  }
  return rows;
}

async function phase(name, setup, withPdf, cpu) {
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
  const stop = cpu();

  const runOne = async (index) => {
    const base = APP_URLS[index % APP_URLS.length];
    while (performance.now() < deadline && sent < MAX_REQUESTS_PER_PHASE) {
      sent += 1;
      let pick = random() * total;
      const { route } = mix.find((m) => (pick -= m.weight) < 0) ?? mix[0];
      const t0 = performance.now();
      let reply;
      try {
        reply = await send(route, setup, index, base, `${name} ${sent}`);
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
  const used = stop();
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
    appCpuMsPerRequest: (used.appS * 1000) / count,
    dbCpuMsPerRequest: (used.dbS * 1000) / count,
    routes,
  };
}

function printCpu(rows) {
  const f = (ms) => (Number.isFinite(ms) ? ms.toFixed(1).padStart(8) : "       –");
  console.log(
    `\nCPU per request, one client, each route alone (${CPU_SAMPLES} requests; PDFs fewer):`,
  );
  console.log(
    `${"route".padEnd(34)} ${"count".padStart(6)} ${"p50 ms".padStart(8)} ${"app ms".padStart(8)} ${"db ms".padStart(8)} errors`,
  );
  for (const r of rows)
    console.log(
      `${r.route.padEnd(34)} ${String(r.count).padStart(6)} ${f(r.p50)} ${f(r.appMs)} ${f(r.dbMs)} ${r.errors}`,
    );
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
  console.log(
    `CPU per request (all routes): app ${result.appCpuMsPerRequest.toFixed(1)} ms, PostgreSQL ${result.dbCpuMsPerRequest.toFixed(1)} ms`,
  );
}

async function main() {
  const database = process.env.EMBERLINE_LOAD_DB_NAME ?? "emberline_load";
  const { env, stopCluster } = await bootstrap({
    database,
    // Each run starts from the same lab, so runs before and after a change measure the same data. Only
    // a bench database (its name ends in "_load") is ever dropped: EMBERLINE_LOAD_DB_NAME naming the
    // app's own database keeps it, as --keep-lab does.
    freshDatabase: !args.includes("--keep-lab") && database.endsWith("_load"),
    mailPort: Number(process.env.EMBERLINE_SMTP_PORT ?? 2525),
    mailDir: "mail-load",
  });
  const pgPort = Number(process.env.EMBERLINE_PG_PORT ?? 54329);
  const dataRoot = path.resolve(root, process.env.EMBERLINE_DATA_DIR ?? ".data");
  const postmasterPid = Number(
    fs.readFileSync(path.join(dataRoot, "postgres", "postmaster.pid"), "utf8").split("\n")[0],
  );
  const next = path.join(root, "node_modules", ".bin", "next");
  try {
    if (!args.includes("--demo-only"))
      await seedRealisticLab(`postgres://postgres@${host}:${pgPort}/${database}`, log);
    if (args.includes("--build") || !fs.existsSync(path.join(root, ".next", "BUILD_ID"))) {
      log("Building the app (next build)…");
      const build = spawnSync(next, ["build"], {
        cwd: root,
        stdio: "inherit",
        env: { ...env, NODE_ENV: "production" },
      });
      if (build.status !== 0) throw new Error("next build failed");
    }
    const appPids = [];
    for (const [i, url] of APP_URLS.entries()) {
      const child = startChild(next, ["start", "-H", host, "-p", String(port + i)], {
        env: { ...env, APP_URL: url, NODE_ENV: "production" },
        stdio: ["ignore", "ignore", "inherit"],
      });
      appPids.push(child.pid);
      await waitForPort(port + i, 180_000, host);
    }
    const cpu = () => cpuMeter(appPids, postmasterPid);
    log(
      `Load bench: ${CLIENTS} clients × ${SECONDS} s per phase against ${APP_URLS.join(" and ")} (loopback only).`,
    );
    const setup = await prepare();
    // Warm-up: nothing compiles in production, but the worker threads start on first use (on each instance).
    for (const url of APP_URLS) await send(PDF_ROUTE, setup, 0, url, "warm-up");
    const perRoute = await perRouteCpu(setup, cpu);
    printCpu(perRoute);
    const without = await phase("without PDFs", setup, false, cpu);
    print(without);
    const withPdf = await phase(
      `with PDFs (${(PDF_SHARE * 100).toFixed(0)} % of requests)`,
      setup,
      true,
      cpu,
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
          instances: INSTANCES,
          perRoute,
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
