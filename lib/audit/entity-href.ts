// The page of the record an audit event is about: the trail's links and the home page's activity.

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
