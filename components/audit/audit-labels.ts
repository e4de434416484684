// Names and links of the things an audit event can be about, and how its times and values read.
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

/** The page of the record an event is about, where it has one. */
export function entityHref(entity: string, entityId: string | null): string | null {
  if (!entityId) return null;
  const id = encodeURIComponent(entityId);
  switch (entity) {
    case "run":
      return `/runs/${id}`;
    case "calibration":
      return `/calibrations/${id}`;
    case "line_release":
      return `/lines?release=${id}`;
    case "notebook":
      return `/notebooks/${id}`;
    case "instrument":
      return `/instruments/${id}`;
    case "line":
      return `/lines/${id}`;
    default:
      return null;
  }
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
