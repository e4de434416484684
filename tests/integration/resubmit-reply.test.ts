// A returned run goes back to review only changed or with a reply to the comments (issue 14, item 8):
// unchanged and without a reply it is refused with a 422 sentence on `reply` and nothing is written;
// with a reply the reply is kept on the new round and in the audit event; a changed run needs none.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { ApiClient, ErrorBody } from "./support/http-client";
import { signInDemo } from "./support/accounts";
import { auditEventsSince, auditMark, closeDb, db } from "./support/database";
import { draftRun, type DraftRun } from "./support/review-fixtures";

interface History {
  status: string;
  reviewRound: number;
  rounds: { round: number; decision: string | null; comment: string; reply: string }[];
}

let lead: ApiClient;
let chemist: ApiClient;
let supervisor: ApiClient;

beforeAll(async () => {
  [lead, chemist, supervisor] = await Promise.all([
    signInDemo("labLead"),
    signInDemo("chemist"),
    signInDemo("supervisor"),
  ]);
}, 120_000);

afterAll(async () => {
  await closeDb();
});

/** A draft run submitted once and returned with a comment. */
async function returnedRun(): Promise<DraftRun> {
  const run = await draftRun(lead, chemist, chemist, "Resubmit");
  const submitted = await chemist.post(`/api/runs/${run.id}/submit`, {});
  expect(submitted.status, JSON.stringify(submitted.body)).toBe(200);
  const back = await supervisor.post(`/api/runs/${run.id}/review`, {
    decision: "return",
    comment: "Is the K I doublet really absent?",
  });
  expect(back.status, JSON.stringify(back.body)).toBe(200);
  return run;
}

const roundsOf = async (runId: string) =>
  (
    await db().query<{ round: number; reply: string }>(
      "SELECT round, reply FROM run_rounds WHERE run_id = $1 ORDER BY round",
      [runId],
    )
  ).rows;

describe("resubmitting a returned run", () => {
  it("refuses the run unchanged and without a reply, with a sentence on reply, and writes nothing", async () => {
    const run = await returnedRun();
    const mark = await auditMark();
    for (const body of [{}, { reply: "   " }]) {
      const refused = await chemist.post<ErrorBody>(`/api/runs/${run.id}/submit`, body);
      expect(refused.status).toBe(422);
      expect(refused.body.error.message).toBe(
        "The run is unchanged since it was returned: reply to the reviewer's comments, or change the run, before submitting it again.",
      );
      expect(refused.body.error.fieldErrors?.reply).toEqual([
        "Say how you dealt with the reviewer's comments.",
      ]);
    }
    expect(await roundsOf(run.id)).toHaveLength(1);
    const row = await db().query("SELECT status, review_round FROM runs WHERE id = $1", [run.id]);
    expect(row.rows[0]).toMatchObject({ status: "returned", review_round: 1 });
    expect(await auditEventsSince(mark, { action: "run.submit" })).toHaveLength(0);
  });

  it("takes the run unchanged with a reply, kept on the new round and in the audit event", async () => {
    const run = await returnedRun();
    const mark = await auditMark();
    const reply = "The K I 766.5 nm line sits under the flame's OH band; the call stands.";
    const submitted = await chemist.post<History>(`/api/runs/${run.id}/submit`, { reply });
    expect(submitted.status, JSON.stringify(submitted.body)).toBe(200);
    expect(submitted.body.rounds.map((r) => [r.round, r.decision, r.reply])).toEqual([
      [1, "returned", ""],
      [2, null, reply],
    ]);
    expect((await roundsOf(run.id)).map((r) => r.reply)).toEqual(["", reply]);
    const [event] = await auditEventsSince(mark, { action: "run.submit" });
    expect(event.after).toMatchObject({ status: "submitted", round: 2, reply });
  });

  it("takes a changed run without a reply", async () => {
    const run = await returnedRun();
    const lockVersion = (
      await db().query<{ lock_version: number }>("SELECT lock_version FROM runs WHERE id = $1", [
        run.id,
      ])
    ).rows[0].lock_version;
    const notes = await chemist.request("PATCH", `/api/runs/${run.id}`, {
      json: { notes: "Rechecked the K I doublet on a second loop.", lockVersion },
    });
    expect(notes.status, JSON.stringify(notes.body)).toBe(200);
    const submitted = await chemist.post<History>(`/api/runs/${run.id}/submit`, {});
    expect(submitted.status, JSON.stringify(submitted.body)).toBe(200);
    expect(submitted.body).toMatchObject({ status: "submitted", reviewRound: 2 });
  });

  it("keeps the first submission free of the rule: a draft needs no reply", async () => {
    const run = await draftRun(lead, chemist, chemist, "Resubmit");
    const submitted = await chemist.post<History>(`/api/runs/${run.id}/submit`, {});
    expect(submitted.status, JSON.stringify(submitted.body)).toBe(200);
  });
});
