// The one record-id test used by every [id] route and page: UUIDs pass, hostile segments do not.
import { describe, expect, it } from "vitest";
import { isRecordId } from "@/lib/validation/record-id";

describe("isRecordId", () => {
  it("accepts UUIDs in either case", () => {
    expect(isRecordId("7bba6ccc-7378-4e16-bd1b-04049c463c03")).toBe(true);
    expect(isRecordId("7BBA6CCC-7378-4E16-BD1B-04049C463C03")).toBe(true);
  });

  it.each([
    "",
    "%C0%AF",
    "\u00c0\u00af",
    "..",
    "1",
    "7bba6ccc-7378-4e16-bd1b-04049c463c03\u0000",
    `7bba6ccc-7378-4e16-bd1b-04049c463c03${"0".repeat(300)}`,
  ])("refuses %j", (value) => {
    expect(isRecordId(value)).toBe(false);
  });

  it("refuses a missing segment", () => {
    expect(isRecordId(undefined)).toBe(false);
  });
});
