// The one test of a record id from a URL: every table's key is a UUID, so anything else (a broken
// escape, a number, "..", a long string) is "not found" before it reaches a query.
import { z } from "zod";

const uuid = z.uuid();

export function isRecordId(value: string | undefined): value is string {
  return typeof value === "string" && value.length === 36 && uuid.safeParse(value).success;
}
