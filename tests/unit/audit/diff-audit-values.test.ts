// The before/after comparison of audit events: nested objects, arrays, shape changes, added and
// removed keys, creations without a before, and the leaf listing the page shows side by side.
import { describe, expect, it } from "vitest";
import { diffAuditValues, flattenAuditValue } from "@/lib/audit/diff-audit-values";

describe("diffAuditValues", () => {
  it("finds changed, added and removed leaves at any depth", () => {
    const before = {
      name: "Bench A",
      model: { kind: "polynomial", coefficients: [350, 0.27, 1e-6] },
      notes: "old",
      tags: ["a"],
    };
    const after = {
      name: "Bench A",
      model: { kind: "polynomial", coefficients: [350, 0.28] },
      tags: ["a", "b"],
      extra: { x: 1 },
    };
    expect(diffAuditValues(before, after)).toEqual([
      { path: "model.coefficients[1]", kind: "changed", before: 0.27, after: 0.28 },
      { path: "model.coefficients[2]", kind: "removed", before: 1e-6, after: undefined },
      { path: "notes", kind: "removed", before: "old", after: undefined },
      { path: "tags[1]", kind: "added", before: undefined, after: "b" },
      { path: "extra", kind: "added", before: undefined, after: { x: 1 } },
    ]);
  });

  it("reports a change of shape once, at its path", () => {
    expect(diffAuditValues({ model: { a: 1 } }, { model: 3 })).toEqual([
      { path: "model", kind: "changed", before: { a: 1 }, after: 3 },
    ]);
    expect(diffAuditValues({ v: [] }, { v: {} })).toEqual([
      { path: "v", kind: "changed", before: [], after: {} },
    ]);
  });

  it("treats null as a value and equal values as unchanged", () => {
    expect(diffAuditValues({ a: null, b: 2 }, { a: 1, b: 2 })).toEqual([
      { path: "a", kind: "changed", before: null, after: 1 },
    ]);
    expect(diffAuditValues({ a: { b: [1, { c: "x" }] } }, { a: { b: [1, { c: "x" }] } })).toEqual(
      [],
    );
  });

  it("has nothing to compare for a creation or a removal", () => {
    expect(diffAuditValues(null, { a: 1 })).toEqual([]);
    expect(diffAuditValues({ a: 1 }, null)).toEqual([]);
  });

  it("compares bare values at the root and stops at maxChanges", () => {
    expect(diffAuditValues("draft", "published")).toEqual([
      { path: "", kind: "changed", before: "draft", after: "published" },
    ]);
    const many = diffAuditValues(
      Array.from({ length: 50 }, (_, i) => i),
      Array.from({ length: 50 }, (_, i) => i + 1),
      { maxChanges: 10 },
    );
    expect(many).toHaveLength(10);
    expect(() => diffAuditValues({}, {}, { maxChanges: 0 })).toThrow(RangeError);
  });
});

describe("flattenAuditValue", () => {
  it("lists every leaf with its path, empty containers included", () => {
    expect(flattenAuditValue({ a: 1, b: { c: [true, null] }, d: [], e: {} })).toEqual([
      { path: "a", value: 1 },
      { path: "b.c[0]", value: true },
      { path: "b.c[1]", value: null },
      { path: "d", value: [] },
      { path: "e", value: {} },
    ]);
    expect(flattenAuditValue(null)).toEqual([]);
    expect(flattenAuditValue({ xs: Array.from({ length: 20 }, (_, i) => i) }, 5)).toHaveLength(5);
  });
});
