// The roles a person can hold in a team, with the words the interface uses for them.
export const TEAM_ROLES = ["chemist", "supervisor", "lab_lead"] as const;
export type TeamRole = (typeof TEAM_ROLES)[number];

export const ROLE_LABELS: Record<TeamRole, string> = {
  chemist: "Chemist",
  supervisor: "Supervisor",
  lab_lead: "Lab lead",
};
