// The one policy as a matrix: every role against every action, written out here as the brief's roles
// put it (chemists record and submit, supervisors review and sign off, lab leads curate the line table,
// the instruments and the team), so a change to the policy shows as a change to this table. The HTTP
// matrix (tests/integration/access-matrix.test.ts) checks the same rules through the routes.
import { describe, expect, it } from "vitest";
import type { Actor } from "@/lib/auth/actor";
import { authorize, can, type TeamAction } from "@/lib/auth/policy";
import type { TeamRole } from "@/lib/auth/roles";
import { AppError } from "@/lib/errors";

const TEAM = "team-a";
const OTHER_TEAM = "team-b";

function member(role: TeamRole, extra: Partial<Actor> = {}): Actor {
  return {
    id: `user-${role}`,
    email: `${role}@example.test`,
    name: role,
    memberships: [{ teamId: TEAM, teamName: "Team A", role }],
    ...extra,
  };
}

// C chemist, S supervisor, L lab lead: who may take each action in their own team.
const EXPECTED: Record<TeamAction, string> = {
  "team.view": "CSL",
  "team.manageMembers": "L",
  "team.readMailbox": "L",
  "instrument.view": "CSL",
  "instrument.manage": "L",
  "spectrum.upload": "CSL",
  "calibration.create": "CSL",
  "notebook.create": "CSL",
  "run.create": "CSL",
  "run.edit": "CSL",
  "run.review": "S",
  "lines.view": "CSL",
  "lines.edit": "L",
  "lines.publish": "L",
  "audit.view": "CSL",
  "audit.verify": "L",
};

const LETTER: Record<TeamRole, string> = { chemist: "C", supervisor: "S", lab_lead: "L" };
const ROLES: TeamRole[] = ["chemist", "supervisor", "lab_lead"];

describe("can(): roles × actions", () => {
  for (const [action, allowed] of Object.entries(EXPECTED) as [TeamAction, string][]) {
    it(`${action}: ${allowed.split("").join(", ")} only`, () => {
      const row = ROLES.filter((role) => can(member(role), action, { teamId: TEAM }))
        .map((role) => LETTER[role])
        .join("");
      expect(row).toBe(allowed);
    });
  }

  it("gives a member of another team, and no one signed in, nothing in this team", () => {
    for (const action of Object.keys(EXPECTED) as TeamAction[]) {
      for (const role of ROLES) {
        expect(can(member(role), action, { teamId: OTHER_TEAM })).toBe(false);
      }
      expect(can(null, action, { teamId: TEAM })).toBe(false);
    }
  });

  it("lets a person manage only their own tokens and password, and no team action reaches a person", () => {
    const chemist = member("chemist");
    for (const action of ["self.manageTokens", "self.changePassword"] as const) {
      expect(can(chemist, action, { userId: chemist.id })).toBe(true);
      expect(can(chemist, action, { userId: "someone-else" })).toBe(false);
      expect(can(member("lab_lead"), action, { userId: chemist.id })).toBe(false);
      expect(can(chemist, action, { teamId: TEAM })).toBe(false);
    }
    expect(can(member("lab_lead"), "team.manageMembers", { userId: chemist.id })).toBe(false);
  });
});

describe("authorize(): what a refusal says", () => {
  const codeOf = (run: () => void) => {
    try {
      run();
    } catch (error) {
      return error instanceof AppError ? error.code : "other";
    }
    return "allowed";
  };

  it("allows what can() allows", () => {
    expect(codeOf(() => authorize(member("supervisor"), "run.review", { teamId: TEAM }))).toBe(
      "allowed",
    );
  });

  it("answers a member without the role 'forbidden', and an outsider 'not found' (the team's data is not revealed)", () => {
    expect(codeOf(() => authorize(member("chemist"), "run.review", { teamId: TEAM }))).toBe(
      "forbidden",
    );
    expect(codeOf(() => authorize(member("lab_lead"), "team.view", { teamId: OTHER_TEAM }))).toBe(
      "not_found",
    );
    expect(
      codeOf(() => authorize(member("chemist"), "self.changePassword", { userId: "someone-else" })),
    ).toBe("not_found");
  });

  it("tells a person removed from the team since the credential was issued that it no longer opens it", () => {
    const removed = { ...member("chemist"), memberships: [], removedFrom: [TEAM] };
    expect(codeOf(() => authorize(removed, "team.view", { teamId: TEAM }))).toBe("unauthenticated");
  });
});
