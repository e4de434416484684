// The plural ending of a counted noun in a call's rationale.

/** "s" unless the count is one. */
export function plural(count: number): string {
  return count === 1 ? "" : "s";
}
