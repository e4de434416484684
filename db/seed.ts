// Seeds the demo lab (an invented lab with invented people). Idempotent: a second run adds nothing twice.
// After the people and line tables, each team gets an instrument, its demo lamp and sample spectra, a
// calibration and notebooks with runs, all made through the app's own services (run with tsx
// --conditions=react-server so their "server-only" import resolves), so the demo records are real analyses.
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { QueryTypes, type Transaction } from "sequelize";
import { hashPassword } from "../lib/auth/password";
import { parseLineTableCsv } from "../lib/lines";
import { BULK_INSERT_LINES_SQL, bulkInsertPayload } from "../lib/services/line-library-rows";
import type { Actor } from "../lib/auth/actor";
import type { TeamRole } from "../lib/auth/roles";
import type { InstrumentCreateInput } from "../lib/validation/instrument-schemas";
import {
  AuditEvent,
  Calibration,
  Instrument,
  Membership,
  Notebook,
  Run,
  SpectrumFile,
  Team,
  User,
  sequelize,
} from "../models";

export const DEMO_PASSWORD = "emberline-demo";

export const DEMO_PEOPLE: { email: string; name: string; memberships: [string, TeamRole][] }[] = [
  {
    email: "chem@demo.emberline.example",
    name: "Mara Quist",
    memberships: [["Flame Screening", "chemist"]],
  },
  {
    email: "super@demo.emberline.example",
    name: "Tobias Wren",
    memberships: [["Flame Screening", "supervisor"]],
  },
  {
    email: "bench@demo.emberline.example",
    name: "Noor Halvorsen",
    memberships: [["Arc and Spark Bench", "lab_lead"]],
  },
  {
    email: "lead@demo.emberline.example",
    name: "Ilse Varga",
    memberships: [
      ["Flame Screening", "lab_lead"],
      ["Arc and Spark Bench", "supervisor"],
    ],
  },
];

export async function seedDemo(): Promise<void> {
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  await sequelize.transaction(async (transaction) => {
    const teams = new Map<string, Team>();
    for (const name of new Set(DEMO_PEOPLE.flatMap((p) => p.memberships.map(([team]) => team)))) {
      const [team, created] = await Team.findOrCreate({ where: { name }, transaction });
      if (created) {
        await AuditEvent.create(
          {
            actorId: null,
            teamId: team.id,
            action: "team.create",
            entity: "team",
            entityId: team.id,
            before: null,
            after: { name },
            reason: "Demo data",
          },
          { transaction },
        );
      }
      teams.set(name, team);
    }
    for (const person of DEMO_PEOPLE) {
      const [user, created] = await User.findOrCreate({
        where: { email: person.email },
        defaults: { email: person.email, name: person.name, passwordHash },
        transaction,
      });
      if (created) {
        await AuditEvent.create(
          {
            actorId: null,
            teamId: null,
            action: "user.create",
            entity: "user",
            entityId: user.id,
            before: null,
            after: { email: user.email },
            reason: "Demo data",
          },
          { transaction },
        );
      }
      for (const [teamName, role] of person.memberships) {
        const team = teams.get(teamName)!;
        const [membership, joined] = await Membership.findOrCreate({
          where: { userId: user.id, teamId: team.id },
          defaults: { userId: user.id, teamId: team.id, role },
          transaction,
        });
        if (joined) {
          await AuditEvent.create(
            {
              actorId: null,
              teamId: team.id,
              action: "membership.create",
              entity: "membership",
              entityId: membership.id,
              before: null,
              after: { userId: user.id, role },
              reason: "Demo data",
            },
            { transaction },
          );
        }
      }
    }
    for (const team of teams.values()) await seedStarterRelease(team, transaction);
  });
  await seedDemoWorkflow();
}

const STARTER_CSV = path.join(__dirname, "lines", "starter-lines.csv");

/**
 * Release 1 of a team that has no line table yet: the starter CSV, inserted into a draft in one
 * statement and then frozen by publishing it. Teams that already have releases are left alone.
 */
async function seedStarterRelease(team: Team, transaction: Transaction): Promise<void> {
  const [{ count }] = await sequelize.query<{ count: string }>(
    "SELECT count(*) AS count FROM line_releases WHERE team_id = $1",
    { bind: [team.id], type: QueryTypes.SELECT, transaction },
  );
  if (Number(count) > 0) return;
  const parsed = parseLineTableCsv(fs.readFileSync(STARTER_CSV, "utf8"));
  if (parsed.errors.length > 0) {
    const first = parsed.errors[0];
    throw new Error(
      `${STARTER_CSV}:${first.line}: ${first.field}: ${first.message} (${parsed.errors.length} problems)`,
    );
  }
  const [release] = await sequelize.query<{ id: string }>(
    "INSERT INTO line_releases (team_id) VALUES ($1) RETURNING id",
    { bind: [team.id], type: QueryTypes.SELECT, transaction },
  );
  await sequelize.query(BULK_INSERT_LINES_SQL, {
    bind: [release.id, bulkInsertPayload(parsed.rows)],
    transaction,
  });
  const notes =
    "Starter table: flame-test elements, hydrogen, lamp gases and mercury, flame bands (typed from memory, unverified).";
  await sequelize.query(
    `UPDATE line_releases SET status = 'published', number = 1, notes = $2, published_at = now() WHERE id = $1`,
    { bind: [release.id, notes], transaction },
  );
  await AuditEvent.create(
    {
      actorId: null,
      teamId: team.id,
      action: "line_release.publish",
      entity: "line_release",
      entityId: release.id,
      before: null,
      after: { status: "published", number: 1, lineCount: parsed.rows.length },
      reason: "Starter table",
    },
    { transaction },
  );
}

const DEMO_DIR = path.join(__dirname, "demo");

interface DemoSpectrum {
  file: string;
  kind: "lamp" | "sample";
  label: string;
}

interface DemoRun {
  spectrum: string;
  source: "flame" | "arc" | "spark" | "plasma" | "lamp";
  /** Where the demo run stands in review: left a draft, submitted by the analyst, or also signed by `signer`. */
  review?: { state: "submitted" } | { state: "signed"; signer: string };
}

/** What each demo team works with: who sets the instrument up, who analyses, and the runs they made. */
const DEMO_BENCHES: {
  team: string;
  lead: string;
  analyst: string;
  instrument: Omit<InstrumentCreateInput, "teamId">;
  lamp: DemoSpectrum;
  samples: DemoSpectrum[];
  notebooks: { title: string; runs: DemoRun[] }[];
}[] = [
  {
    team: "Flame Screening",
    lead: "lead@demo.emberline.example",
    analyst: "chem@demo.emberline.example",
    instrument: {
      name: "Bench grating",
      dispersion: "grating",
      pixels: 2048,
      nominalMinNm: 350,
      nominalMaxNm: 900,
      resolutionNm: 1,
      detectorMax: null,
      glass: null,
      apexDeg: null,
    },
    lamp: {
      file: "bench-grating-lamp-hg-ar.csv",
      kind: "lamp",
      label: "Hg–Ar pencil lamp, morning check",
    },
    samples: [
      {
        file: "bench-grating-flame-sample.csv",
        kind: "sample",
        label: "Mixed chloride salts, loop 1",
      },
      {
        file: "bench-grating-lamp-check.csv",
        kind: "sample",
        label: "Hg–Ar lamp, read back as a sample",
      },
    ],
    notebooks: [
      {
        title: "Chloride salts, week 48",
        runs: [
          {
            spectrum: "bench-grating-flame-sample.csv",
            source: "flame",
            review: { state: "submitted" },
          },
        ],
      },
      {
        title: "Lamp read-back checks",
        runs: [
          {
            spectrum: "bench-grating-lamp-check.csv",
            source: "lamp",
            review: { state: "signed", signer: "super@demo.emberline.example" },
          },
        ],
      },
    ],
  },
  {
    team: "Arc and Spark Bench",
    lead: "bench@demo.emberline.example",
    analyst: "bench@demo.emberline.example",
    instrument: {
      name: "Bench prism (F2)",
      dispersion: "prism",
      pixels: 2048,
      nominalMinNm: 350,
      nominalMaxNm: 940,
      resolutionNm: 1,
      detectorMax: null,
      glass: "F2",
      apexDeg: 60,
    },
    lamp: { file: "bench-prism-lamp-hg-ar.csv", kind: "lamp", label: "Hg–Ar pencil lamp" },
    samples: [
      {
        file: "bench-prism-flame-sample.csv",
        kind: "sample",
        label: "Chloride salts in the flame adapter",
      },
      {
        file: "bench-prism-lamp-check.csv",
        kind: "sample",
        label: "Hg–Ar lamp, read back as a sample",
      },
    ],
    notebooks: [
      {
        title: "Prism commissioning",
        runs: [
          { spectrum: "bench-prism-lamp-check.csv", source: "lamp" },
          { spectrum: "bench-prism-flame-sample.csv", source: "flame" },
        ],
      },
    ],
  },
];

/** A demo person as the services see them (the same shape the session gives a signed-in person). */
async function demoActor(email: string): Promise<Actor> {
  const user = await User.findOne({ where: { email } });
  if (!user) throw new Error(`No demo person ${email}`);
  const memberships = await sequelize.query<{ team_id: string; name: string; role: TeamRole }>(
    "SELECT m.team_id, t.name, m.role FROM memberships m JOIN teams t ON t.id = m.team_id WHERE m.user_id = $1",
    { bind: [user.id], type: QueryTypes.SELECT },
  );
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    memberships: memberships.map((m) => ({ teamId: m.team_id, teamName: m.name, role: m.role })),
  };
}

/**
 * Each demo team's bench, step by step through the services; every step first looks for what an
 * earlier seed made (instrument by name, spectrum by hash, calibration by lamp, notebook by title,
 * run by notebook, sample and source), so a second run adds nothing and a half-finished one completes.
 */
async function seedDemoWorkflow(): Promise<void> {
  // Loaded here, not at the top: they are the app's services and need the react-server condition.
  const { createInstrument } = await import("../lib/services/instruments");
  const { uploadSpectrum } = await import("../lib/services/spectra");
  const { createCalibration } = await import("../lib/services/calibrations");
  const { createNotebook } = await import("../lib/services/notebooks");
  const { createRun } = await import("../lib/services/runs");
  const { reviewRun, submitRun } = await import("../lib/services/run-review-decisions");

  for (const bench of DEMO_BENCHES) {
    const team = await Team.findOne({ where: { name: bench.team } });
    if (!team) throw new Error(`No demo team ${bench.team}`);
    const lead = await demoActor(bench.lead);
    const analyst = await demoActor(bench.analyst);

    const instrumentId =
      (await Instrument.findOne({ where: { teamId: team.id, name: bench.instrument.name } }))?.id ??
      (await createInstrument(lead, { ...bench.instrument, teamId: team.id })).id;

    const spectrumIds = new Map<string, string>();
    for (const spectrum of [bench.lamp, ...bench.samples]) {
      const bytes = fs.readFileSync(path.join(DEMO_DIR, spectrum.file));
      const sha256 = createHash("sha256").update(bytes).digest("hex");
      const existing = await SpectrumFile.findOne({
        where: { teamId: team.id, instrumentId, sha256, kind: spectrum.kind },
      });
      const id =
        existing?.id ??
        (
          await uploadSpectrum(analyst, {
            instrumentId,
            kind: spectrum.kind,
            label: spectrum.label,
            fileName: spectrum.file,
            bytes: new Uint8Array(bytes),
          })
        ).id;
      spectrumIds.set(spectrum.file, id);
    }

    const lampId = spectrumIds.get(bench.lamp.file)!;
    const calibrationId =
      (await Calibration.findOne({ where: { spectrumId: lampId } }))?.id ??
      // No confirmation reason: the demo lamps calibrate without doubts, and a seed that met one should fail loudly.
      (
        await createCalibration(analyst, {
          instrumentId,
          spectrumId: lampId,
          lamps: ["Hg", "Ar"],
          model: "auto",
          excluded: [],
          added: [],
        })
      ).id;

    for (const book of bench.notebooks) {
      const notebookId =
        (await Notebook.findOne({ where: { teamId: team.id, title: book.title } }))?.id ??
        (await createNotebook(analyst, { teamId: team.id, title: book.title })).id;
      for (const run of book.runs) {
        const spectrumId = spectrumIds.get(run.spectrum)!;
        const existing = await Run.findOne({
          where: { notebookId, spectrumId, source: run.source },
          attributes: ["id", "status"],
        });
        const runId =
          existing?.id ??
          (
            await createRun(analyst, {
              notebookId,
              spectrumId,
              calibrationId,
              source: run.source,
              settings: {},
            })
          ).id;
        // Through the review service too, so the queue, the mails and the audit trail tell the demo's story.
        let status = existing?.status ?? "draft";
        if (run.review && status === "draft") status = (await submitRun(analyst, runId, {})).status;
        if (run.review?.state === "signed" && status === "submitted") {
          const signer = await demoActor(run.review.signer);
          await reviewRun(
            signer,
            runId,
            { decision: "sign", comment: "", password: DEMO_PASSWORD },
            { address: "127.0.0.1" },
          );
        }
      }
    }
  }
}

if (require.main === module) {
  seedDemo()
    .then(async () => {
      process.stdout.write("[emberline] Demo data is in place.\n");
      await sequelize.close();
    })
    .catch(async (error) => {
      process.stderr.write(
        `[emberline] Seeding failed: ${error instanceof Error ? error.stack : error}\n`,
      );
      await sequelize.close();
      process.exit(1);
    });
}
