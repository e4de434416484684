// Before/after comparison of an audit event's JSON: which leaf fields changed, were added or were
// removed, at any depth. Pure (no I/O), so the service, the CSV export and the tests share it.

export type AuditChangeKind = "added" | "removed" | "changed";

export interface AuditChange {
  /** Where the field sits: `model.coefficients[2]`, `name`; "" for a bare (non-object) value. */
  path: string;
  kind: AuditChangeKind;
  /** The old value (undefined when added). */
  before: unknown;
  /** The new value (undefined when removed). */
  after: unknown;
}

export interface DiffAuditValuesOptions {
  /**
   * Stop after this many changes, so that a huge before/after cannot flood a page.
   * @default 500
   */
  maxChanges?: number;
}

export interface AuditLeaf {
  path: string;
  value: unknown;
}

type Json = Record<string, unknown>;

function isObject(value: unknown): value is Json {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

function isContainer(value: unknown): value is Json | unknown[] {
  return Array.isArray(value) || isObject(value);
}

function join(path: string, key: string | number): string {
  if (typeof key === "number") return `${path}[${key}]`;
  return path ? `${path}.${key}` : key;
}

/**
 * The changed leaf fields between `before` and `after`. A creation (no before) or a removal (no after)
 * has nothing to compare and gives no changes: its one side is the whole story. Objects are compared
 * key by key, arrays index by index; a value that turns from an object into a number is one change at
 * its path. Key order: before's keys, then keys only after has.
 */
export function diffAuditValues(
  before: unknown,
  after: unknown,
  options: DiffAuditValuesOptions = {},
): AuditChange[] {
  const maxChanges = options.maxChanges ?? 500;
  if (!Number.isInteger(maxChanges) || maxChanges < 1)
    throw new RangeError("maxChanges must be a positive integer");
  if (before === null || before === undefined || after === null || after === undefined) return [];
  const changes: AuditChange[] = [];
  const walk = (b: unknown, a: unknown, path: string): void => {
    if (changes.length >= maxChanges) return;
    if (Array.isArray(b) && Array.isArray(a)) {
      for (let i = 0; i < Math.max(b.length, a.length); i++) {
        visit(i < b.length, b[i], i < a.length, a[i], join(path, i));
      }
      return;
    }
    if (isObject(b) && isObject(a)) {
      const keys = [...Object.keys(b), ...Object.keys(a).filter((k) => !Object.hasOwn(b, k))];
      for (const key of keys)
        visit(Object.hasOwn(b, key), b[key], Object.hasOwn(a, key), a[key], join(path, key));
      return;
    }
    if (!sameValue(b, a)) changes.push({ path, kind: "changed", before: b, after: a });
  };
  const visit = (hasB: boolean, b: unknown, hasA: boolean, a: unknown, path: string): void => {
    if (changes.length >= maxChanges) return;
    if (hasB && !hasA) changes.push({ path, kind: "removed", before: b, after: undefined });
    else if (!hasB && hasA) changes.push({ path, kind: "added", before: undefined, after: a });
    else walk(b, a, path);
  };
  walk(before, after, "");
  return changes;
}

function sameValue(a: unknown, b: unknown): boolean {
  if (isContainer(a) || isContainer(b)) {
    // Reached only when the two differ in shape (array vs object, container vs scalar), or are
    // both empty containers of the same kind.
    return JSON.stringify(a) === JSON.stringify(b) && Array.isArray(a) === Array.isArray(b);
  }
  return Object.is(a, b);
}

/**
 * Every leaf of a JSON value with its path, for showing before and after side by side. Empty
 * objects and arrays are leaves of their own. Stops after `limit` leaves.
 */
export function flattenAuditValue(value: unknown, limit = 300): AuditLeaf[] {
  const leaves: AuditLeaf[] = [];
  const walk = (v: unknown, path: string): void => {
    if (leaves.length >= limit) return;
    if (Array.isArray(v) && v.length > 0) v.forEach((item, i) => walk(item, join(path, i)));
    else if (isObject(v) && Object.keys(v).length > 0)
      for (const [k, item] of Object.entries(v)) walk(item, join(path, k));
    else leaves.push({ path, value: v });
  };
  if (value !== null && value !== undefined) walk(value, "");
  return leaves;
}
