// The default team: where a person opens and what the API answers for without ?teamId=. One rule for
// both, so a person with several teams sees the same team on /instruments and GET /api/instruments.
import { describe, expect, it } from "vitest";
import type { TeamMembership } from "@/lib/auth/actor";
import { defaultTeamId } from "@/lib/auth/default-team";

const arc: TeamMembership = {
  teamId: "b-arc",
  teamName: "Arc and Spark Bench",
  role: "supervisor",
};
const flame: TeamMembership = { teamId: "a-flame", teamName: "Flame Screening", role: "lab_lead" };
const plasma: TeamMembership = { teamId: "c-plasma", teamName: "Plasma Corner", role: "chemist" };

describe("defaultTeamId", () => {
  it("is undefined for a person in no team", () => {
    expect(defaultTeamId({ memberships: [] })).toBeUndefined();
  });

  it("is the only team of a person in one", () => {
    expect(defaultTeamId({ memberships: [plasma] })).toBe("c-plasma");
  });

  it("is the team of the widest role, not the one whose name sorts first", () => {
    // A lab lead in Flame Screening and a supervisor in Arc and Spark Bench (the demo lead) opens
    // in Flame Screening, although "Arc…" sorts first.
    expect(defaultTeamId({ memberships: [arc, flame] })).toBe("a-flame");
    expect(defaultTeamId({ memberships: [plasma, arc] })).toBe("b-arc");
  });

  it("takes lab lead over supervisor over chemist whatever the order", () => {
    const all = [plasma, arc, flame];
    for (const order of [all, [...all].reverse(), [arc, flame, plasma]]) {
      expect(defaultTeamId({ memberships: order })).toBe("a-flame");
    }
  });

  it("breaks a tie of roles by team name, then by id, so the order read never decides", () => {
    const zinc: TeamMembership = { teamId: "a-zinc", teamName: "Zinc Lab", role: "chemist" };
    const boron: TeamMembership = { teamId: "z-boron", teamName: "Boron Lab", role: "chemist" };
    expect(defaultTeamId({ memberships: [zinc, boron] })).toBe("z-boron");
    expect(defaultTeamId({ memberships: [boron, zinc] })).toBe("z-boron");
    const twin: TeamMembership = { ...boron, teamId: "y-boron" };
    expect(defaultTeamId({ memberships: [boron, twin] })).toBe("y-boron");
    expect(defaultTeamId({ memberships: [twin, boron] })).toBe("y-boron");
  });

  it("does not reorder the memberships it is given", () => {
    const memberships = [plasma, arc, flame];
    defaultTeamId({ memberships });
    expect(memberships).toEqual([plasma, arc, flame]);
  });
});
