// Review and sign-off through HTTP against the real PostgreSQL, with the e-mails read from the fake
// SMTP server: submit → return → resubmit → sign; a wrong password signs nothing; chemists and a run's
// own author cannot sign; a signed run refuses every edit and is amended by a linked new version; the
// signed hash is recomputed from the stored rows; the queue lists what waits, oldest first.
import { createHash } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  buildRunContent,
  calibrationModelLabel,
  canonicalJson,
  runContentHash,
  type RunContentSource,
} from "@/lib/services/run-content";
import { APP_URL, type ApiClient, type ErrorBody } from "./support/http-client";
import {
  DEMO,
  DEMO_PASSWORD,
  FLAME_SCREENING,
  createAccountThroughInvitation,
  signInDemo,
  signedIn,
  teamIdOf,
  type FreshAccount,
} from "./support/accounts";
import { OUTSIDER, ensureOutsider } from "./support/outsider";
import { auditEventsSince, auditMark, closeDb, db, userIdByEmail } from "./support/database";
import { mailTo, waitForMail } from "./support/mailbox";
import { draftRun, reviewBench, type DraftRun } from "./support/review-fixtures";

interface History {
  runId: string;
  status: string;
  reviewRound: number;
  versionNumber: number;
  rounds: {
    round: number;
    submittedBy: { id: string; name: string } | null;
    requestedReviewer: { id: string; name: string } | null;
    decision: string | null;
    decidedBy: { id: string; name: string } | null;
    comment: string;
    marks: {
      species: string;
      lineNm: number | null;
      agreement: string | null;
      comment: string;
      reviewer: { name: string } | null;
    }[];
  }[];
  signature: {
    signerName: string;
    meaning: string;
    contentHash: string;
    signedAt: string;
    signer: { id: string };
  } | null;
  versions: { id: string; versionNumber: number; status: string }[];
  amendsRunId: string | null;
  amendedById: string | null;
}

interface Queue {
  items: {
    runId: string;
    author: { id: string; name: string } | null;
    instrument: { id: string; name: string };
    present: string[];
    submittedAt: string;
    waitingSeconds: number;
    namedToMe: boolean;
  }[];
  total: number;
  options: { authors: { id: string }[]; instruments: { id: string }[]; species: string[] };
}

let lead: ApiClient;
let chemist: ApiClient;
let supervisor: ApiClient;
let outsider: ApiClient;
let second: FreshAccount;
let secondClient: ApiClient;
let teamId: string;
let chemistId: string;
let supervisorId: string;
let leadId: string;

beforeAll(async () => {
  lead = await signInDemo("labLead");
  chemist = await signInDemo("chemist");
  supervisor = await signInDemo("supervisor");
  await ensureOutsider();
  outsider = await signedIn(OUTSIDER.email, OUTSIDER.password);
  teamId = await teamIdOf(lead, FLAME_SCREENING);
  [chemistId, supervisorId, leadId] = await Promise.all(
    [DEMO.chemist, DEMO.supervisor, DEMO.labLead].map((p) => userIdByEmail(p.email)),
  );
  // A second supervisor of the team: the one whose password is got wrong, so the demo account is never throttled.
  second = await createAccountThroughInvitation(lead, { label: "reviewer", role: "supervisor" });
  secondClient = await signedIn(second.email, second.password);
  await reviewBench(lead, chemist, "Review cycle");
});

afterAll(closeDb);

const newRun = (author: ApiClient = chemist) => draftRun(lead, author, chemist, "Review cycle");
const history = async (runId: string, client: ApiClient = chemist) => {
  const reply = await client.get<History>(`/api/runs/${runId}/history`);
  expect(reply.status, JSON.stringify(reply.body)).toBe(200);
  return reply.body;
};
/** How many messages to `to` have a subject matching `subject` (waitForMail's `skip`). */
const mailCount = (to: string, subject: RegExp) =>
  mailTo(to).filter((m) => subject.test(m.subject)).length;
const SUBMITTED = /^Run submitted for review/;
const runRow = async (runId: string) =>
  (
    await db().query(
      "SELECT status, review_round, signed_at, notes, version_number, amends_run_id, lock_version FROM runs WHERE id = $1",
      [runId],
    )
  ).rows[0];

/** The run's content rebuilt from its rows, the way a report or an auditor would. */
async function contentFromRows(runId: string) {
  const run = (await db().query("SELECT * FROM runs WHERE id = $1", [runId])).rows[0];
  const spectrum = (
    await db().query("SELECT sha256 FROM spectrum_files WHERE id = $1", [run.spectrum_id])
  ).rows[0];
  const calibration = run.calibration_id
    ? (
        await db().query("SELECT id, model, rms_nm FROM calibrations WHERE id = $1", [
          run.calibration_id,
        ])
      ).rows[0]
    : null;
  const release = (
    await db().query("SELECT id, number FROM line_releases WHERE id = $1", [run.line_release_id])
  ).rows[0];
  const overrides = (
    await db().query("SELECT * FROM run_overrides WHERE run_id = $1 ORDER BY created_at, id", [
      runId,
    ])
  ).rows;
  const source: RunContentSource = {
    run: {
      id: run.id,
      teamId: run.team_id,
      notebookId: run.notebook_id,
      spectrumId: run.spectrum_id,
      calibrationId: run.calibration_id,
      lineReleaseId: run.line_release_id,
      source: run.source,
      settings: run.settings,
      lampChecked: run.lamp_checked,
      softwareVersion: run.software_version,
      rangeMinNm: run.range_min_nm,
      rangeMaxNm: run.range_max_nm,
      noiseCounts: run.noise_counts,
      peaks: run.peaks,
      calls: run.calls,
      unexplained: run.unexplained,
      warnings: run.warnings,
      notes: run.notes,
      versionNumber: run.version_number,
      amendsRunId: run.amends_run_id,
      rerunOfId: run.rerun_of_id,
      createdById: run.created_by_id,
    },
    spectrumSha256: spectrum.sha256,
    calibration: calibration
      ? {
          id: calibration.id,
          model: calibrationModelLabel(calibration.model),
          rmsNm: calibration.rms_nm,
        }
      : null,
    lineRelease: { id: release.id, number: release.number },
    overrides: overrides.map((o) => ({
      id: o.id,
      species: o.species,
      computedVerdict: o.computed_verdict,
      verdict: o.verdict,
      reason: o.reason,
      createdById: o.created_by_id,
      createdAt: new Date(o.created_at).toISOString(),
    })),
  };
  return { source, content: buildRunContent(source), spectrumSha256: spectrum.sha256 as string };
}

describe("the submit → return → resubmit → sign cycle", () => {
  let run: DraftRun;
  let signedHash: string;

  it("mails every supervisor of the team (never the author) on submission and locks the run for its author", async () => {
    run = await newRun();
    const before = {
      super: mailCount(DEMO.supervisor.email, SUBMITTED),
      second: mailCount(second.email, SUBMITTED),
      chemist: mailTo(DEMO.chemist.email).length,
    };
    const submitted = await chemist.post<History>(`/api/runs/${run.id}/submit`, {});
    expect(submitted.status, JSON.stringify(submitted.body)).toBe(200);
    expect(submitted.body).toMatchObject({ status: "submitted", reviewRound: 1 });
    expect(submitted.body.rounds).toHaveLength(1);
    expect(submitted.body.rounds[0]).toMatchObject({
      round: 1,
      submittedBy: { id: chemistId },
      requestedReviewer: null,
      decision: null,
    });

    for (const [to, skip] of [
      [DEMO.supervisor.email, before.super],
      [second.email, before.second],
    ] as const) {
      const mail = await waitForMail({ to, subject: SUBMITTED, skip });
      expect(mail.text).toContain(`${APP_URL}/review/${run.id}`);
      expect(mail.text).toContain(DEMO.chemist.name);
    }
    expect(mailTo(DEMO.chemist.email).length).toBe(before.chemist);

    // Submitted: the author cannot submit again until it is returned.
    const again = await chemist.post<ErrorBody>(`/api/runs/${run.id}/submit`, {});
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/waiting for review/);
    const row = await runRow(run.id);
    expect(row).toMatchObject({ status: "submitted", review_round: 1 });
  });

  it("is returned with a comment (required), e-mailed to the author with the comment and a link", async () => {
    const noComment = await supervisor.post<ErrorBody>(`/api/runs/${run.id}/review`, {
      decision: "return",
    });
    expect(noComment.status).toBe(400);
    expect(noComment.body.error.fieldErrors?.comment).toBeDefined();

    const skip = mailCount(DEMO.chemist.email, /^Run returned/);
    const comment = `Check the Li I 670.8 nm line against the lamp again (${Date.now()}).`;
    const returned = await supervisor.post<History>(`/api/runs/${run.id}/review`, {
      decision: "return",
      comment,
    });
    expect(returned.status, JSON.stringify(returned.body)).toBe(200);
    expect(returned.body.status).toBe("returned");
    expect(returned.body.rounds[0]).toMatchObject({
      decision: "returned",
      decidedBy: { id: supervisorId },
      comment,
    });

    const mail = await waitForMail({ to: DEMO.chemist.email, subject: /^Run returned/, skip });
    expect(mail.text).toContain(comment);
    expect(mail.text).toContain(`${APP_URL}/runs/${run.id}`);
    expect(mail.text).toContain(DEMO.supervisor.name);
  });

  it("is revised and resubmitted to a named reviewer, who alone is mailed; the rounds are kept", async () => {
    // The revision: a note and an overridden call, through the run's own edit routes.
    const notes = await chemist.request("PATCH", `/api/runs/${run.id}`, {
      json: {
        notes: "Li I 670.8 nm rechecked against a fresh lamp spectrum.",
        lockVersion: (await runRow(run.id)).lock_version,
      },
    });
    expect(notes.status, JSON.stringify(notes.body)).toBe(200);
    const possible = run.calls.find((c) => c.verdict === "possible") ?? run.calls[0];
    const override = await chemist.post(`/api/runs/${run.id}/overrides`, {
      species: possible.species,
      verdict: "absent",
      reason: "Only one weak line; not enough to call it.",
    });
    expect(override.status, JSON.stringify(override.body)).toBe(201);

    const notSupervisor = await chemist.post<ErrorBody>(`/api/runs/${run.id}/submit`, {
      reviewerId: leadId,
    });
    expect(notSupervisor.status).toBe(400);
    expect(notSupervisor.body.error.fieldErrors?.reviewerId).toBeDefined();
    const self = await chemist.post<ErrorBody>(`/api/runs/${run.id}/submit`, {
      reviewerId: chemistId,
    });
    expect(self.status).toBe(400);
    expect((await runRow(run.id)).status).toBe("returned");

    const skip = {
      super: mailCount(DEMO.supervisor.email, SUBMITTED),
      second: mailTo(second.email).length,
    };
    const resubmitted = await chemist.post<History>(`/api/runs/${run.id}/submit`, {
      reviewerId: supervisorId,
    });
    expect(resubmitted.status, JSON.stringify(resubmitted.body)).toBe(200);
    expect(resubmitted.body).toMatchObject({ status: "submitted", reviewRound: 2 });
    expect(resubmitted.body.rounds.map((r) => [r.round, r.decision])).toEqual([
      [1, "returned"],
      [2, null],
    ]);
    expect(resubmitted.body.rounds[1].requestedReviewer?.id).toBe(supervisorId);
    const mail = await waitForMail({
      to: DEMO.supervisor.email,
      subject: SUBMITTED,
      skip: skip.super,
    });
    expect(mail.text).toContain("round 2");
    expect(mailTo(second.email).length).toBe(skip.second);
  });

  it("takes the reviewer's marks on calls and lines, refusing calls and lines the run does not have", async () => {
    const call = run.calls.find((c) => c.verdict === "present" && c.lines.length > 0)!;
    const agree = await supervisor.post(`/api/runs/${run.id}/marks`, {
      species: call.species,
      agreement: "agree",
    });
    expect(agree.status, JSON.stringify(agree.body)).toBe(201);
    const line = await supervisor.post(`/api/runs/${run.id}/marks`, {
      species: call.species,
      lineNm: call.lines[0].lineNm,
      comment: "Clean, well-separated line.",
    });
    expect(line.status, JSON.stringify(line.body)).toBe(201);
    expect(
      (
        await supervisor.post<ErrorBody>(`/api/runs/${run.id}/marks`, {
          species: "Xx I",
          agreement: "agree",
        })
      ).status,
    ).toBe(400);
    expect(
      (
        await supervisor.post<ErrorBody>(`/api/runs/${run.id}/marks`, {
          species: call.species,
          lineNm: 123.456,
          comment: "?",
        })
      ).status,
    ).toBe(400);
    expect(
      (await supervisor.post<ErrorBody>(`/api/runs/${run.id}/marks`, { species: call.species }))
        .status,
    ).toBe(400);
    expect(
      (
        await chemist.post<ErrorBody>(`/api/runs/${run.id}/marks`, {
          species: call.species,
          agreement: "agree",
        })
      ).status,
    ).toBe(403);

    const marks = (await history(run.id)).rounds[1].marks;
    expect(marks.map((m) => [m.species, m.lineNm, m.agreement, m.comment])).toEqual([
      [call.species, null, "agree", ""],
      [call.species, call.lines[0].lineNm, null, "Clean, well-separated line."],
    ]);
    expect(marks[0].reviewer?.name).toBe(DEMO.supervisor.name);
  });

  it("is signed with the password: meaning, signer, time and the content hash recorded, the run locked", async () => {
    expect(
      (
        await chemist.post<ErrorBody>(`/api/runs/${run.id}/review`, {
          decision: "sign",
          password: DEMO_PASSWORD,
        })
      ).status,
    ).toBe(403);
    expect(
      (
        await lead.post<ErrorBody>(`/api/runs/${run.id}/review`, {
          decision: "sign",
          password: DEMO_PASSWORD,
        })
      ).status,
    ).toBe(403);
    const noPassword = await supervisor.post<ErrorBody>(`/api/runs/${run.id}/review`, {
      decision: "sign",
    });
    expect(noPassword.status).toBe(400);
    expect(noPassword.body.error.fieldErrors?.password).toBeDefined();

    const startedAt = Date.now();
    const signed = await supervisor.post<History>(`/api/runs/${run.id}/review`, {
      decision: "sign",
      password: DEMO_PASSWORD,
      comment: "Agreed.",
    });
    expect(signed.status, JSON.stringify(signed.body)).toBe(200);
    expect(signed.body.status).toBe("signed");
    expect(signed.body.rounds[1]).toMatchObject({
      decision: "signed",
      decidedBy: { id: supervisorId },
      comment: "Agreed.",
    });
    expect(signed.body.signature).toMatchObject({
      signerName: DEMO.supervisor.name,
      meaning: "Reviewed and approved",
      signer: { id: supervisorId },
    });
    const signedAt = Date.parse(signed.body.signature!.signedAt);
    expect(signedAt).toBeGreaterThanOrEqual(startedAt - 5_000);
    expect(signedAt).toBeLessThanOrEqual(Date.now() + 5_000);
    signedHash = signed.body.signature!.contentHash;
    expect(signedHash).toMatch(/^[0-9a-f]{64}$/);

    const row = await runRow(run.id);
    expect(row.status).toBe("signed");
    expect(new Date(row.signed_at).getTime()).toBe(signedAt);
    const stored = (
      await db().query(
        "SELECT content_hash, signer_id, round FROM run_signatures WHERE run_id = $1",
        [run.id],
      )
    ).rows;
    expect(stored).toEqual([{ content_hash: signedHash, signer_id: supervisorId, round: 2 }]);
  });

  it("signs a hash that matches the run's record recomputed from the stored rows", async () => {
    const { content, source, spectrumSha256 } = await contentFromRows(run.id);
    expect(runContentHash(content)).toBe(signedHash);
    // The hash is SHA-256 of the canonical JSON, whose keys are sorted at every level.
    expect(createHash("sha256").update(canonicalJson(content)).digest("hex")).toBe(signedHash);
    expect(canonicalJson({ b: 1, a: { d: [2, { z: 0, y: 1 }], c: null } })).toBe(
      '{"a":{"c":null,"d":[2,{"y":1,"z":0}]},"b":1}',
    );
    // It covers what the run is made from and what it says, including the revision.
    expect(content).toMatchObject({
      runId: run.id,
      spectrum: { id: run.spectrumId, sha256: spectrumSha256 },
      calibration: { id: run.calibrationId },
      notes: "Li I 670.8 nm rechecked against a fresh lamp spectrum.",
      versionNumber: 1,
      amendsRunId: null,
    });
    const overridden = (
      content.calls as { species: string; standingVerdict: string; computedVerdict: string }[]
    ).find((c) => c.standingVerdict !== c.computedVerdict);
    expect(overridden?.standingVerdict).toBe("absent");
    // Any change of what was signed gives another hash.
    expect(
      runContentHash(
        buildRunContent({ ...source, run: { ...source.run, notes: `${source.run.notes}.` } }),
      ),
    ).not.toBe(signedHash);
  });

  it("refuses every edit of the signed run (409), and the database refuses a direct UPDATE", async () => {
    const mark = await auditMark();
    const call = run.calls[0];
    const attempts = [
      await chemist.post<ErrorBody>(`/api/runs/${run.id}/submit`, {}),
      await supervisor.post<ErrorBody>(`/api/runs/${run.id}/marks`, {
        species: call.species,
        agreement: "disagree",
      }),
      await supervisor.post<ErrorBody>(`/api/runs/${run.id}/review`, {
        decision: "return",
        comment: "Once more.",
      }),
      await secondClient.post<ErrorBody>(`/api/runs/${run.id}/review`, {
        decision: "sign",
        password: second.password,
      }),
      await chemist.request<ErrorBody>("PATCH", `/api/runs/${run.id}`, {
        json: { notes: "after signing", lockVersion: (await runRow(run.id)).lock_version },
      }),
      await chemist.post<ErrorBody>(`/api/runs/${run.id}/overrides`, {
        species: call.species,
        verdict: "absent",
        reason: "after signing",
      }),
    ];
    expect(attempts.map((a) => a.status)).toEqual([409, 409, 409, 409, 409, 409]);
    // The database refuses an override of a signed run even if a service forgot to ask.
    await expect(
      db().query(
        "INSERT INTO run_overrides (run_id, species, computed_verdict, verdict, reason) VALUES ($1, $2, 'present', 'absent', 'x')",
        [run.id, call.species],
      ),
    ).rejects.toThrow(/submitted or signed/);
    await expect(
      db().query("UPDATE runs SET notes = 'changed after signing' WHERE id = $1", [run.id]),
    ).rejects.toThrow(/signed run is never edited/);
    await expect(
      db().query("UPDATE run_signatures SET meaning = 'other' WHERE run_id = $1", [run.id]),
    ).rejects.toThrow(/cannot be changed/);
    expect((await runRow(run.id)).notes).toBe(
      "Li I 670.8 nm rechecked against a fresh lamp spectrum.",
    );
    expect(await auditEventsSince(mark, { actorId: chemistId })).toEqual([]);
    expect(await auditEventsSince(mark, { actorId: supervisorId })).toEqual([]);
  });

  it("is amended by a linked new draft version carrying the notes and standing overrides, once only", async () => {
    expect((await outsider.post<ErrorBody>(`/api/runs/${run.id}/amend`)).status).toBe(404);
    const amended = await chemist.post<{ id: string; versionNumber: number; amendsRunId: string }>(
      `/api/runs/${run.id}/amend`,
    );
    expect(amended.status, JSON.stringify(amended.body)).toBe(201);
    expect(amended.body).toMatchObject({ versionNumber: 2, amendsRunId: run.id });
    const row = await runRow(amended.body.id);
    expect(row).toMatchObject({
      status: "draft",
      review_round: 0,
      version_number: 2,
      amends_run_id: run.id,
      notes: "Li I 670.8 nm rechecked against a fresh lamp spectrum.",
    });
    type Fetched = {
      calls: { override: { id: string; at: string } | null }[];
      verdicts: Record<string, string>;
      peaks: unknown;
    };
    const fetched = await chemist.get<Fetched>(`/api/runs/${amended.body.id}`);
    const original = await chemist.get<Fetched>(`/api/runs/${run.id}`);
    // The amendment carries each standing override as a new row of its own (own id and time), same verdict and reason.
    const withoutRowIdentity = (calls: Fetched["calls"]) =>
      calls.map((c) => ({
        ...c,
        override: c.override && { ...c.override, id: undefined, at: undefined },
      }));
    expect(withoutRowIdentity(fetched.body.calls)).toEqual(withoutRowIdentity(original.body.calls));
    expect(fetched.body.calls.some((c) => c.override !== null)).toBe(true);
    expect(fetched.body.peaks).toEqual(original.body.peaks);
    expect(fetched.body.verdicts).toEqual(original.body.verdicts);

    const twice = await chemist.post<ErrorBody>(`/api/runs/${run.id}/amend`);
    expect(twice.status).toBe(409);
    const draftAmend = await chemist.post<ErrorBody>(`/api/runs/${amended.body.id}/amend`);
    expect(draftAmend.status).toBe(409);

    const chain = await history(amended.body.id);
    expect(chain.versions.map((v) => [v.id, v.versionNumber, v.status])).toEqual([
      [run.id, 1, "signed"],
      [amended.body.id, 2, "draft"],
    ]);
    expect((await history(run.id)).amendedById).toBe(amended.body.id);

    // The amendment goes through review again.
    const submitted = await chemist.post<History>(`/api/runs/${amended.body.id}/submit`, {});
    expect(submitted.body).toMatchObject({ status: "submitted", reviewRound: 1 });
  });
});

describe("refusals", () => {
  it("a wrong password answers 401 and changes nothing: no signature, no decision, no audit event", async () => {
    const run = await newRun();
    expect((await chemist.post(`/api/runs/${run.id}/submit`, {})).status).toBe(200);
    const before = await runRow(run.id);
    const mark = await auditMark();
    const wrong = await secondClient.post<ErrorBody>(`/api/runs/${run.id}/review`, {
      decision: "sign",
      password: `${second.password}x`,
    });
    expect(wrong.status).toBe(401);
    expect(wrong.body.error.message).toMatch(/Nothing was signed/);
    expect(await runRow(run.id)).toEqual(before);
    expect(
      (
        await db().query("SELECT count(*)::int AS n FROM run_signatures WHERE run_id = $1", [
          run.id,
        ])
      ).rows[0].n,
    ).toBe(0);
    expect(
      (await db().query("SELECT decision FROM run_rounds WHERE run_id = $1", [run.id])).rows,
    ).toEqual([{ decision: null }]);
    expect(await auditEventsSince(mark, { actorId: second.userId })).toEqual([]);
    // The right password still signs.
    const right = await secondClient.post<History>(`/api/runs/${run.id}/review`, {
      decision: "sign",
      password: second.password,
    });
    expect(right.status, JSON.stringify(right.body)).toBe(200);
    expect(right.body.signature?.signerName).toBe(second.name);
  });

  it("wrong signing passwords fall under the one password throttle; the signer is not locked out elsewhere", async () => {
    const third = await createAccountThroughInvitation(lead, {
      label: "throttled-signer",
      role: "supervisor",
    });
    const here = await signedIn(third.email, third.password);
    const run = await newRun();
    expect((await chemist.post(`/api/runs/${run.id}/submit`, {})).status).toBe(200);
    for (let attempt = 1; attempt <= 3; attempt++) {
      const wrong = await here.post(`/api/runs/${run.id}/review`, {
        decision: "sign",
        password: `wrong ${attempt}`,
      });
      expect(wrong.status, `attempt ${attempt}`).toBe(401);
    }
    // The pair (this account, this address) must now wait: even the right password is not checked.
    const waiting = await here.post<ErrorBody>(`/api/runs/${run.id}/review`, {
      decision: "sign",
      password: third.password,
    });
    expect(waiting.status).toBe(429);
    expect(waiting.body.error.code).toBe("rate_limited");
    expect(
      (
        await db().query("SELECT count(*)::int AS n FROM run_signatures WHERE run_id = $1", [
          run.id,
        ])
      ).rows[0].n,
    ).toBe(0);
    // From another address the signer signs at once.
    const elsewhere = await signedIn(third.email, third.password);
    const signed = await elsewhere.post<History>(`/api/runs/${run.id}/review`, {
      decision: "sign",
      password: third.password,
    });
    expect(signed.status, JSON.stringify(signed.body)).toBe(200);
  });

  it("a supervisor cannot sign, return or mark their own run, nor name themselves as its reviewer", async () => {
    const own = await newRun(supervisor);
    const self = await supervisor.post<ErrorBody>(`/api/runs/${own.id}/submit`, {
      reviewerId: supervisorId,
    });
    expect(self.status).toBe(400);
    expect((await supervisor.post(`/api/runs/${own.id}/submit`, {})).status).toBe(200);
    const mark = await auditMark();
    const sign = await supervisor.post<ErrorBody>(`/api/runs/${own.id}/review`, {
      decision: "sign",
      password: DEMO_PASSWORD,
    });
    expect(sign.status).toBe(403);
    expect(sign.body.error.message).toMatch(/own run/);
    expect(
      (await supervisor.post(`/api/runs/${own.id}/review`, { decision: "return", comment: "mine" }))
        .status,
    ).toBe(403);
    expect(
      (
        await supervisor.post(`/api/runs/${own.id}/marks`, {
          species: own.calls[0].species,
          agreement: "agree",
        })
      ).status,
    ).toBe(403);
    expect((await runRow(own.id)).status).toBe("submitted");
    expect(await auditEventsSince(mark, { actorId: supervisorId })).toEqual([]);
    // Their own run is not in their queue; it is in the other supervisor's.
    const mine = await supervisor.get<Queue>(`/api/review-queue?teamId=${teamId}`);
    expect(mine.body.items.map((i) => i.runId)).not.toContain(own.id);
    const theirs = await secondClient.get<Queue>(`/api/review-queue?teamId=${teamId}`);
    expect(theirs.body.items.map((i) => i.runId)).toContain(own.id);
  });

  it("two supervisors deciding at once: the row lock lets one decide, the other gets 409", async () => {
    const run = await newRun();
    expect((await chemist.post(`/api/runs/${run.id}/submit`, {})).status).toBe(200);
    const replies = await Promise.all([
      supervisor.post(`/api/runs/${run.id}/review`, {
        decision: "return",
        comment: "First reviewer.",
      }),
      secondClient.post(`/api/runs/${run.id}/review`, {
        decision: "sign",
        password: second.password,
      }),
    ]);
    expect(replies.map((r) => r.status).sort()).toEqual([200, 409]);
    const decided = (
      await db().query("SELECT decision, decided_by_id FROM run_rounds WHERE run_id = $1", [run.id])
    ).rows;
    expect(decided).toHaveLength(1);
    const winner =
      replies[0].status === 200
        ? { decision: "returned", by: supervisorId }
        : { decision: "signed", by: second.userId };
    expect(decided[0]).toEqual({ decision: winner.decision, decided_by_id: winner.by });
    expect((await runRow(run.id)).status).toBe(winner.decision);
  });

  it("another team's run answers 404 on every review route; marks need a submitted run", async () => {
    const run = await newRun();
    for (const [path, body] of [
      ["submit", {}],
      ["marks", { species: run.calls[0].species, agreement: "agree" }],
      ["review", { decision: "return", comment: "x" }],
      ["amend", undefined],
    ] as const) {
      expect((await outsider.post(`/api/runs/${run.id}/${path}`, body)).status, path).toBe(404);
    }
    expect((await outsider.get(`/api/runs/${run.id}/history`)).status).toBe(404);
    expect(
      (
        await supervisor.post(`/api/runs/${run.id}/marks`, {
          species: run.calls[0].species,
          agreement: "agree",
        })
      ).status,
    ).toBe(409);
    expect((await supervisor.post(`/api/runs/${run.id}/submit`, {})).status).toBe(403);
  });
});

describe("the review queue", () => {
  it("lists the runs waiting for the supervisor oldest first, with age, author, instrument and species, and filters", async () => {
    const { instrumentId } = await reviewBench(lead, chemist, "Review cycle");
    const first = await newRun();
    const next = await newRun();
    const namedToOther = await newRun();
    expect((await chemist.post(`/api/runs/${first.id}/submit`, {})).status).toBe(200);
    expect(
      (await chemist.post(`/api/runs/${next.id}/submit`, { reviewerId: supervisorId })).status,
    ).toBe(200);
    expect(
      (await chemist.post(`/api/runs/${namedToOther.id}/submit`, { reviewerId: second.userId }))
        .status,
    ).toBe(200);

    const queue = await supervisor.get<Queue>(`/api/review-queue?teamId=${teamId}`);
    expect(queue.status, JSON.stringify(queue.body)).toBe(200);
    const ids = queue.body.items.map((i) => i.runId);
    expect(ids).toContain(first.id);
    expect(ids).toContain(next.id);
    expect(ids).not.toContain(namedToOther.id);
    expect(ids.indexOf(first.id)).toBeLessThan(ids.indexOf(next.id));
    const times = queue.body.items.map((i) => Date.parse(i.submittedAt));
    expect([...times].sort((a, b) => a - b)).toEqual(times);
    const item = queue.body.items.find((i) => i.runId === next.id)!;
    expect(item).toMatchObject({
      author: { id: chemistId, name: DEMO.chemist.name },
      instrument: { id: instrumentId },
      namedToMe: true,
    });
    expect(item.waitingSeconds).toBeGreaterThanOrEqual(0);
    expect(item.present).toEqual(
      next.calls
        .filter((c) => c.verdict === "present")
        .map((c) => c.species)
        .sort(),
    );
    expect(queue.body.total).toBe(queue.body.items.length);

    const species = item.present[0];
    const bySpecies = await supervisor.get<Queue>(
      `/api/review-queue?teamId=${teamId}&species=${encodeURIComponent(species)}`,
    );
    expect(bySpecies.body.items.every((i) => i.present.includes(species))).toBe(true);
    const byOther = await supervisor.get<Queue>(
      `/api/review-queue?teamId=${teamId}&author=${supervisorId}`,
    );
    expect(byOther.body.items).toEqual([]);
    const byInstrument = await supervisor.get<Queue>(
      `/api/review-queue?teamId=${teamId}&instrumentId=${instrumentId}&author=${chemistId}`,
    );
    expect(byInstrument.body.items.map((i) => i.runId)).toContain(first.id);
    expect(byInstrument.body.items.length).toBeGreaterThan(0);
    expect(
      byInstrument.body.items.every(
        (i) => i.instrument.id === instrumentId && i.author?.id === chemistId,
      ),
    ).toBe(true);
    expect(byInstrument.body.total).toBeLessThanOrEqual(queue.body.total);

    // Without ?teamId= a supervisor gets the queue of the team where they review.
    const defaulted = await supervisor.get<Queue>("/api/review-queue");
    expect(defaulted.status, JSON.stringify(defaulted.body)).toBe(200);
    expect(defaulted.body.items.map((i) => i.runId)).toEqual(ids);

    expect((await chemist.get(`/api/review-queue?teamId=${teamId}`)).status).toBe(403);
    expect((await outsider.get(`/api/review-queue?teamId=${teamId}`)).status).toBe(404);
    expect(
      (await supervisor.get<ErrorBody>(`/api/review-queue?teamId=${teamId}&author=nobody`)).status,
    ).toBe(400);
  });
});
