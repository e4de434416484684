// Every mutating route of review and sign-off writes exactly one audit event with the run's status and
// round before and after, in the same transaction as the change; every refused attempt writes none.
// Events are looked up by actor since a mark, so nothing else running can disturb the counts.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { ApiClient } from "./support/http-client";
import { DEMO, DEMO_PASSWORD, FLAME_SCREENING, signInDemo, teamIdOf } from "./support/accounts";
import {
  auditEventsSince,
  auditMark,
  closeDb,
  userIdByEmail,
  type AuditRow,
} from "./support/database";
import { draftRun, type DraftRun } from "./support/review-fixtures";

let lead: ApiClient;
let chemist: ApiClient;
let supervisor: ApiClient;
let teamId: string;
let chemistId: string;
let supervisorId: string;

beforeAll(async () => {
  lead = await signInDemo("labLead");
  chemist = await signInDemo("chemist");
  supervisor = await signInDemo("supervisor");
  teamId = await teamIdOf(lead, FLAME_SCREENING);
  [chemistId, supervisorId] = await Promise.all([
    userIdByEmail(DEMO.chemist.email),
    userIdByEmail(DEMO.supervisor.email),
  ]);
});

afterAll(closeDb);

type State = "draft" | "submitted" | "signed";

/** A run by the demo chemist brought to `state` through the API. */
async function runIn(state: State): Promise<DraftRun> {
  const run = await draftRun(lead, chemist, chemist, "Review audit");
  if (state === "draft") return run;
  expect((await chemist.post(`/api/runs/${run.id}/submit`, {})).status).toBe(200);
  if (state === "signed") {
    expect(
      (
        await supervisor.post(`/api/runs/${run.id}/review`, {
          decision: "sign",
          password: DEMO_PASSWORD,
        })
      ).status,
    ).toBe(200);
  }
  return run;
}

interface MutatingRoute {
  name: string;
  /** The state the run must be in for the mutation. */
  from: State;
  actor: () => ApiClient;
  actorId: () => string;
  path: (run: DraftRun) => string;
  body: (run: DraftRun) => unknown;
  action: string;
  status: number;
  before: { status: string; round: number };
  after: { status: string; round: number };
  /** Attempts of the same route that must be refused, with the status each gets. */
  refused: {
    why: string;
    actor: () => ApiClient;
    actorId: () => string;
    from: State;
    body: (run: DraftRun) => unknown;
    status: number;
  }[];
}

// The mutating routes of review and sign-off: submit, marks, review (return), review (sign), amend.
const ROUTES: MutatingRoute[] = [
  {
    name: "POST /api/runs/:id/submit",
    from: "draft",
    actor: () => chemist,
    actorId: () => chemistId,
    path: (r) => `/api/runs/${r.id}/submit`,
    body: () => ({}),
    action: "run.submit",
    status: 200,
    before: { status: "draft", round: 0 },
    after: { status: "submitted", round: 1 },
    refused: [
      {
        why: "someone else's run",
        actor: () => supervisor,
        actorId: () => supervisorId,
        from: "draft",
        body: () => ({}),
        status: 403,
      },
      {
        why: "a named reviewer who is not a supervisor",
        actor: () => chemist,
        actorId: () => chemistId,
        from: "draft",
        body: () => ({ reviewerId: chemistId }),
        status: 400,
      },
      {
        why: "already submitted",
        actor: () => chemist,
        actorId: () => chemistId,
        from: "submitted",
        body: () => ({}),
        status: 409,
      },
    ],
  },
  {
    name: "POST /api/runs/:id/marks",
    from: "submitted",
    actor: () => supervisor,
    actorId: () => supervisorId,
    path: (r) => `/api/runs/${r.id}/marks`,
    body: (r) => ({
      species: r.calls[0].species,
      agreement: "disagree",
      comment: "Needs a second line.",
    }),
    action: "run.review_mark",
    status: 201,
    before: { status: "submitted", round: 1 },
    after: { status: "submitted", round: 1 },
    refused: [
      {
        why: "a chemist",
        actor: () => chemist,
        actorId: () => chemistId,
        from: "submitted",
        body: (r) => ({ species: r.calls[0].species, agreement: "agree" }),
        status: 403,
      },
      {
        why: "a draft",
        actor: () => supervisor,
        actorId: () => supervisorId,
        from: "draft",
        body: (r) => ({ species: r.calls[0].species, agreement: "agree" }),
        status: 409,
      },
      {
        why: "an empty mark",
        actor: () => supervisor,
        actorId: () => supervisorId,
        from: "submitted",
        body: (r) => ({ species: r.calls[0].species }),
        status: 400,
      },
    ],
  },
  {
    name: "POST /api/runs/:id/review (return)",
    from: "submitted",
    actor: () => supervisor,
    actorId: () => supervisorId,
    path: (r) => `/api/runs/${r.id}/review`,
    body: () => ({ decision: "return", comment: "Recheck the sodium doublet." }),
    action: "run.return",
    status: 200,
    before: { status: "submitted", round: 1 },
    after: { status: "returned", round: 1 },
    refused: [
      {
        why: "no comment",
        actor: () => supervisor,
        actorId: () => supervisorId,
        from: "submitted",
        body: () => ({ decision: "return" }),
        status: 400,
      },
      {
        why: "a chemist",
        actor: () => chemist,
        actorId: () => chemistId,
        from: "submitted",
        body: () => ({ decision: "return", comment: "x" }),
        status: 403,
      },
      {
        why: "a signed run",
        actor: () => supervisor,
        actorId: () => supervisorId,
        from: "signed",
        body: () => ({ decision: "return", comment: "x" }),
        status: 409,
      },
    ],
  },
  {
    name: "POST /api/runs/:id/review (sign)",
    from: "submitted",
    actor: () => supervisor,
    actorId: () => supervisorId,
    path: (r) => `/api/runs/${r.id}/review`,
    body: () => ({ decision: "sign", password: DEMO_PASSWORD }),
    action: "run.sign",
    status: 200,
    before: { status: "submitted", round: 1 },
    after: { status: "signed", round: 1 },
    refused: [
      {
        why: "a chemist",
        actor: () => chemist,
        actorId: () => chemistId,
        from: "submitted",
        body: () => ({ decision: "sign", password: DEMO_PASSWORD }),
        status: 403,
      },
      {
        why: "a draft",
        actor: () => supervisor,
        actorId: () => supervisorId,
        from: "draft",
        body: () => ({ decision: "sign", password: DEMO_PASSWORD }),
        status: 409,
      },
      {
        why: "no password",
        actor: () => supervisor,
        actorId: () => supervisorId,
        from: "submitted",
        body: () => ({ decision: "sign" }),
        status: 400,
      },
    ],
  },
  {
    name: "POST /api/runs/:id/amend",
    from: "signed",
    actor: () => chemist,
    actorId: () => chemistId,
    path: (r) => `/api/runs/${r.id}/amend`,
    body: () => undefined,
    action: "run.amend",
    status: 201,
    before: { status: "signed", round: 1 },
    after: { status: "draft", round: 0 },
    refused: [
      {
        why: "a run not signed",
        actor: () => chemist,
        actorId: () => chemistId,
        from: "submitted",
        body: () => undefined,
        status: 409,
      },
    ],
  },
];

describe("audit of review and sign-off", () => {
  for (const route of ROUTES) {
    it(`${route.name} writes one audit event with the status and round before and after`, async () => {
      const run = await runIn(route.from);
      const mark = await auditMark();
      const reply = await route.actor().post<{ id?: string }>(route.path(run), route.body(run));
      expect(reply.status, JSON.stringify(reply.body)).toBe(route.status);
      const events: AuditRow[] = await auditEventsSince(mark, { actorId: route.actorId() });
      expect(events.map((e) => e.action)).toEqual([route.action]);
      const [event] = events;
      expect(event).toMatchObject({ entity: "run", team_id: teamId });
      // An amendment's event names the new version; the others name the run itself.
      expect(event.entity_id).toBe(route.action === "run.amend" ? reply.body.id : run.id);
      expect(event.before).toMatchObject(route.before);
      expect(event.after).toMatchObject(route.after);
    });

    for (const refused of route.refused) {
      it(`${route.name} refused (${refused.why}) answers ${refused.status} and writes no audit event`, async () => {
        const run = await runIn(refused.from);
        const mark = await auditMark();
        const reply = await refused.actor().post(route.path(run), refused.body(run));
        expect(reply.status, JSON.stringify(reply.body)).toBe(refused.status);
        expect(await auditEventsSince(mark, { actorId: refused.actorId() })).toEqual([]);
      });
    }
  }
});
