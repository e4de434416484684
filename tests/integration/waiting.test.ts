// What the home page says is waiting, by role, through GET /api/teams/:id/waiting: the author's drafts
// and returned runs, the supervisor's review queue with ages, the lab lead's line table and old
// calibrations; an outsider gets 404 and the activity reads as sentences.
import { beforeAll, describe, expect, it } from "vitest";
import { ApiClient } from "./support/http-client";
import { DEMO, FLAME_SCREENING, signedIn, signInDemo, teamIdOf } from "./support/accounts";
import { draftRun, type DraftRun } from "./support/review-fixtures";
import { ensureOutsider, OUTSIDER } from "./support/outsider";

interface WaitingRun {
  runId: string;
  label: string;
  notebookTitle: string;
  authorName: string | null;
  since: string;
  waitingSeconds: number;
}
interface Waiting {
  role: string;
  returned: { count: number; runs: WaitingRun[] };
  drafts: { count: number; runs: WaitingRun[] };
  review: { count: number; runs: WaitingRun[] } | null;
  lineTable: {
    draft: { releaseId: string; lineCount: number } | null;
    published: { releaseId: string; number: number; unverifiedCount: number } | null;
    oldCalibrations: {
      count: number;
      instruments: {
        instrumentId: string;
        lastCalibratedOn: string | null;
        ageDays: number | null;
      }[];
    };
  } | null;
}

let chemist: ApiClient;
let supervisor: ApiClient;
let lead: ApiClient;
let teamId: string;
let submitted: DraftRun;
let returned: DraftRun;
let draft: DraftRun;

beforeAll(async () => {
  [chemist, supervisor, lead] = await Promise.all([
    signInDemo("chemist"),
    signInDemo("supervisor"),
    signInDemo("labLead"),
  ]);
  teamId = await teamIdOf(chemist, FLAME_SCREENING);
  draft = await draftRun(lead, chemist, chemist, "Waiting");
  submitted = await draftRun(lead, chemist, chemist, "Waiting");
  returned = await draftRun(lead, chemist, chemist, "Waiting");
  for (const run of [submitted, returned]) {
    const reply = await chemist.post(`/api/runs/${run.id}/submit`, {});
    expect(reply.status, JSON.stringify(reply.body)).toBe(200);
  }
  const back = await supervisor.post(`/api/runs/${returned.id}/review`, {
    decision: "return",
    comment: "Check the lamp first.",
  });
  expect(back.status, JSON.stringify(back.body)).toBe(200);
}, 120_000);

const waitingOf = async (client: ApiClient) => {
  const reply = await client.get<Waiting>(`/api/teams/${teamId}/waiting`);
  expect(reply.status, JSON.stringify(reply.body)).toBe(200);
  return reply.body;
};

describe("what is waiting", () => {
  it("shows the author their draft and their returned run, and no review or line-table work", async () => {
    const waiting = await waitingOf(chemist);
    expect(waiting.role).toBe("chemist");
    expect(waiting.review).toBeNull();
    expect(waiting.lineTable).toBeNull();
    expect(waiting.returned.runs.map((r) => r.runId)).toContain(returned.id);
    expect(waiting.returned.runs.map((r) => r.runId)).not.toContain(submitted.id);
    expect(waiting.drafts.count).toBeGreaterThanOrEqual(1);
    expect(waiting.drafts.count).toBeGreaterThanOrEqual(waiting.drafts.runs.length);
    // Oldest first: a long-forgotten draft must not fall off the list behind new ones.
    const since = waiting.drafts.runs.map((r) => r.since);
    expect(since).toEqual([...since].sort());
    const mine = (await waitingOf(chemist)).returned.runs.find((r) => r.runId === returned.id)!;
    expect(mine.authorName).toBe(DEMO.chemist.name);
    expect(mine.waitingSeconds).toBeGreaterThanOrEqual(0);
    expect(mine.waitingSeconds).toBeLessThan(600);
    if (waiting.drafts.count <= waiting.drafts.runs.length)
      expect(waiting.drafts.runs.map((r) => r.runId)).toContain(draft.id);
  });

  it("shows a supervisor the review queue, oldest first, with the submitted run in it", async () => {
    const waiting = await waitingOf(supervisor);
    expect(waiting.role).toBe("supervisor");
    expect(waiting.review).not.toBeNull();
    expect(waiting.review!.count).toBeGreaterThanOrEqual(1);
    const since = waiting.review!.runs.map((r) => r.since);
    expect(since).toEqual([...since].sort());
    // The same rule as the review page's queue, so the same count.
    const queue = await supervisor.get<{ total: number }>(`/api/review-queue?teamId=${teamId}`);
    expect(queue.status).toBe(200);
    expect(waiting.review!.count).toBe(queue.body.total);
    if (waiting.review!.count <= waiting.review!.runs.length)
      expect(waiting.review!.runs.map((r) => r.runId)).toContain(submitted.id);
    expect(waiting.review!.runs.map((r) => r.runId)).not.toContain(returned.id);
    expect(waiting.lineTable).toBeNull();
  });

  it("shows a lab lead the published table's unverified lines and instruments with old or no calibrations", async () => {
    const waiting = await waitingOf(lead);
    expect(waiting.role).toBe("lab_lead");
    expect(waiting.review).toBeNull();
    const table = waiting.lineTable!;
    expect(table.published).not.toBeNull();
    // The starter table is from memory and unverified (README): its lines are all waiting.
    expect(table.published!.unverifiedCount).toBeGreaterThan(100);
    for (const i of table.oldCalibrations.instruments) {
      if (i.lastCalibratedOn === null) expect(i.ageDays).toBeNull();
      else expect(i.ageDays).toBeGreaterThan(7);
    }
    // The instrument made for this test was calibrated today: it is not old.
    const instruments = await lead.get<{ id: string; name: string }[]>(
      `/api/instruments?teamId=${teamId}`,
    );
    expect(instruments.status).toBe(200);
    const fresh = instruments.body.filter((i) => i.name.startsWith("review bench"));
    expect(fresh.length).toBeGreaterThan(0);
    const old = table.oldCalibrations.instruments.map((i) => i.instrumentId);
    for (const instrument of fresh) expect(old).not.toContain(instrument.id);
  });

  it("is not found for someone outside the team, and refused without a session", async () => {
    await ensureOutsider();
    const outsider = await signedIn(OUTSIDER.email, OUTSIDER.password);
    expect((await outsider.get(`/api/teams/${teamId}/waiting`)).status).toBe(404);
    expect((await new ApiClient().get(`/api/teams/${teamId}/waiting`)).status).toBe(401);
  });
});
