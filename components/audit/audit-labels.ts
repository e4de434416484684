// Names and links of the things an audit event can be about, and how its times and values read.
export { entityHref } from "@/lib/audit/entity-href";

const ENTITY_LABELS: Record<string, string> = {
  access_token: "Access token",
  calibration: "Calibration",
  instrument: "Instrument",
  invitation: "Invitation",
  line: "Line",
  line_release: "Line-table release",
  membership: "Membership",
  notebook: "Notebook",
  run: "Run",
  spectrum_file: "Spectrum file",
  team: "Team",
  user: "Person",
};

export function entityLabel(entity: string): string {
  return ENTITY_LABELS[entity] ?? entity.replace(/_/g, " ");
}

/** `2026-12-02 03:41:07 UTC` from an ISO time: the trail's times are always shown in UTC. */
export function utcTime(iso: string): string {
  return `${iso.slice(0, 10)} ${iso.slice(11, 19)} UTC`;
}

/** A short id for tables: the first 8 characters of a UUID. */
export function shortId(id: string): string {
  return id.length > 12 ? `${id.slice(0, 8)}…` : id;
}

export function formatAuditValue(value: unknown): string {
  if (value === undefined) return "—";
  if (typeof value === "string") return value;
  return JSON.stringify(value);
}
