// The shared text schema: control characters and lone surrogates are refused in every free-text field
// (PostgreSQL cannot keep NUL in text or a lone surrogate in the audit trail's jsonb); ordinary text,
// tabs, line breaks and characters outside the BMP pass. Audit dates are bounded.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { auditQuerySchema } from "@/lib/validation/audit-schemas";
import { spectrumUploadFieldsSchema } from "@/lib/validation/upload-schemas";
import { notebookCreateSchema } from "@/lib/validation/notebook-schemas";
import { tokenCreateSchema } from "@/lib/validation/account-schemas";
import { cleanText, isCleanText, text } from "@/lib/validation/text";

describe("isCleanText", () => {
  it.each([
    ["NUL", "a\u0000b"],
    ["escape", "a\u001bb"],
    ["DEL", "a\u007fb"],
    ["lone high surrogate", "a\ud800b"],
    ["lone high surrogate at the end", "a\ud83d"],
    ["lone low surrogate", "\udc00a"],
  ])("refuses %s", (_name, value) => {
    expect(isCleanText(value)).toBe(false);
  });

  it.each([
    ["tab, LF, CR", "a\tb\nc\r\n"],
    ["accents and Greek", "Hα 656.28 nm, Ångström"],
    ["an emoji (a surrogate pair)", "flame 🔥"],
  ])("accepts %s", (_name, value) => {
    expect(isCleanText(value)).toBe(true);
  });

  it("cleanText always yields clean text and leaves clean text alone", () => {
    fc.assert(
      fc.property(fc.string({ unit: "binary" }), (value) => {
        const cleaned = cleanText(value);
        expect(isCleanText(cleaned)).toBe(true);
        if (isCleanText(value)) expect(cleaned).toBe(value);
      }),
    );
  });

  it("agrees with the platform's own well-formedness test on surrogates", () => {
    fc.assert(
      fc.property(fc.string({ unit: "binary" }), (value) => {
        const wellFormed = (value as unknown as { isWellFormed(): boolean }).isWellFormed();
        const hasControl = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/.test(value);
        expect(isCleanText(value)).toBe(wellFormed && !hasControl);
      }),
    );
  });
});

describe("schemas built on text()", () => {
  it("a label, a notebook title and a token name refuse NUL and lone surrogates with a field message", () => {
    const upload = spectrumUploadFieldsSchema.safeParse({
      instrumentId: crypto.randomUUID(),
      kind: "sample",
      label: "x\u0000",
    });
    expect(upload.success).toBe(false);
    expect(upload.error?.issues[0]?.path).toEqual(["label"]);
    expect(
      notebookCreateSchema.safeParse({ teamId: crypto.randomUUID(), title: "\ud800" }).success,
    ).toBe(false);
    expect(tokenCreateSchema.safeParse({ name: "ci\u0000" }).success).toBe(false);
    expect(tokenCreateSchema.safeParse({ name: "ci 🔥" }).success).toBe(true);
  });

  it("text() keeps zod's chaining (trim, min, max)", () => {
    const schema = text().trim().min(2).max(4);
    expect(schema.parse("  ab  ")).toBe("ab");
    expect(schema.safeParse("abcde").success).toBe(false);
  });
});

describe("audit dates", () => {
  it("refuses days outside 1970–2999 instead of failing in the database", () => {
    expect(auditQuerySchema.safeParse({ to: "9999-12-31" }).success).toBe(false);
    expect(auditQuerySchema.safeParse({ from: "0001-01-01" }).success).toBe(false);
    expect(auditQuerySchema.safeParse({ from: "2026-01-01", to: "2999-12-31" }).success).toBe(true);
  });
});
