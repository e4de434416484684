// The tail of a capped list in a call's rationale.

/** ", and N more" for what a capped list leaves out, nothing when it left nothing out. */
export function andMore(count: number): string {
  return count > 0 ? `, and ${count} more` : "";
}
