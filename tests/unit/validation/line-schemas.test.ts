// One rule per line-library use case: the API's schema, the page's form (derived from it) and the
// service's own check agree on a change's reason, a release's notes and a CSV import's size.
import { describe, expect, it } from "vitest";
import { AppError } from "@/lib/errors";
import {
  importApplyFormSchema,
  importPreviewFormSchema,
  lineAddSchema,
  lineChangeSchema,
  publishFormSchema,
} from "@/lib/validation/line-forms";
import {
  checkedLineReason,
  checkedReleaseNotes,
  importApplySchema,
  importPreviewSchema,
  IMPORT_ROUTE_OPTIONS,
  IMPORT_TOO_LARGE_MESSAGE,
  lineStateSchema,
  MAX_IMPORT_BYTES,
  MAX_IMPORT_LABEL,
  publishSchema,
} from "@/lib/validation/line-schemas";

const releaseId = "7bba6ccc-7378-4e16-bd1b-04049c463c03";
const lineId = "0f5c1a52-5d1f-4c4e-9a4f-3b8f2f0d9e11";

/** Whether the API, the form and the service each take a reason. */
function reasonTaken(reason: string) {
  let service = true;
  try {
    checkedLineReason(reason);
  } catch (error) {
    expect(error).toBeInstanceOf(AppError);
    expect((error as AppError).fieldErrors?.reason?.length).toBeGreaterThan(0);
    service = false;
  }
  return {
    api: lineStateSchema.safeParse({ version: 1, reason }).success,
    form: lineChangeSchema.safeParse({ lineId, version: "1", change: "retire", reason }).success,
    addForm: lineAddSchema.safeParse({ releaseId, reason }).success,
    service,
  };
}

describe("a draft change's reason", () => {
  it.each([
    ["", false],
    ["  ", false],
    ["ab", false],
    [" ab ", false],
    ["abc", true],
    ["x".repeat(500), true],
    ["x".repeat(501), false],
    ["x".repeat(1000), false],
  ])("%j is taken by all or by none (%s)", (reason, taken) => {
    expect(reasonTaken(reason)).toEqual({
      api: taken,
      form: taken,
      addForm: taken,
      service: taken,
    });
  });

  it("is trimmed the same way everywhere", () => {
    expect(checkedLineReason("  a typo  ")).toBe("a typo");
    expect(lineStateSchema.parse({ version: 0, reason: "  a typo  " }).reason).toBe("a typo");
  });

  it("is optional for an import, and then follows the same rule", () => {
    const base = { csv: "species,air_nm,source\nNa I,589.0,x\n", fingerprint: "f".repeat(64) };
    expect(importApplySchema.parse({ ...base, reason: "" }).reason).toBeUndefined();
    expect(importApplySchema.parse({ ...base, reason: "  " }).reason).toBeUndefined();
    expect(importApplySchema.safeParse({ ...base, reason: "ab" }).success).toBe(false);
    expect(importApplySchema.safeParse({ ...base, reason: "x".repeat(501) }).success).toBe(false);
    const form = { ...base, releaseId };
    expect(importApplyFormSchema.parse({ ...form, reason: "" }).reason).toBeUndefined();
    expect(importApplyFormSchema.safeParse({ ...form, reason: "x".repeat(501) }).success).toBe(
      false,
    );
    expect(importApplyFormSchema.parse({ ...form, reason: " new lines " }).reason).toBe(
      "new lines",
    );
  });
});

describe("a release's notes", () => {
  it.each([
    ["", false],
    ["ab", false],
    ["abc", true],
    ["x".repeat(4000), true],
    ["x".repeat(4001), false],
    ["x".repeat(5000), false],
  ])("%j is taken by all or by none (%s)", (notes, taken) => {
    let service = true;
    try {
      checkedReleaseNotes(notes);
    } catch {
      service = false;
    }
    expect({
      api: publishSchema.safeParse({ notes }).success,
      form: publishFormSchema.safeParse({ releaseId, notes }).success,
      service,
    }).toEqual({ api: taken, form: taken, service: taken });
  });
});

describe("a CSV import's size", () => {
  it("is one limit, and every sentence names it", () => {
    expect(MAX_IMPORT_LABEL).toBe("5 MB");
    expect(MAX_IMPORT_BYTES).toBe(5 * 1024 * 1024);
    expect(IMPORT_TOO_LARGE_MESSAGE).toContain(MAX_IMPORT_LABEL);
    expect(IMPORT_ROUTE_OPTIONS.tooLargeMessage).toContain(MAX_IMPORT_LABEL);
    // The route's body cap leaves room for JSON's escapes around a file at the limit.
    expect(IMPORT_ROUTE_OPTIONS.maxBodyBytes).toBeGreaterThan(MAX_IMPORT_BYTES);
  });

  it("refuses the same text through the API and the form", () => {
    const atLimit = "#".repeat(MAX_IMPORT_BYTES);
    const over = "#".repeat(MAX_IMPORT_BYTES + 1);
    expect(importPreviewSchema.safeParse({ csv: atLimit }).success).toBe(true);
    expect(importPreviewFormSchema.safeParse({ releaseId, csv: atLimit }).success).toBe(true);
    const api = importPreviewSchema.safeParse({ csv: over });
    const form = importPreviewFormSchema.safeParse({ releaseId, csv: over });
    expect(api.success).toBe(false);
    expect(form.success).toBe(false);
    expect(api.error?.issues[0].message).toBe(IMPORT_TOO_LARGE_MESSAGE);
    expect(form.error?.issues[0].message).toBe(IMPORT_TOO_LARGE_MESSAGE);
  });
});
