// The readers of a request's URL that every route shares: its [id] segment, its team and its query
// string, each refused with the answer a client can act on (404 for a malformed id or team, 400 for a
// bad filter).
import type { z } from "zod";
import { AppError } from "@/lib/errors";
import { parseFields } from "./field-errors";
import { isRecordId } from "./record-id";

/** A route's id segment (every API [id] route): anything but a UUID is "not found", never a database error. */
export function idParam(value: string | undefined, what = "No such record."): string {
  if (!isRecordId(value)) throw new AppError("not_found", what);
  return value;
}

/** Parses a request's query string (teamId aside, which `teamIdQuery` reads) or answers 400 with field messages. */
export function parseQuery<T extends z.ZodType>(request: Request, schema: T): z.infer<T> {
  const params = new URL(request.url).searchParams;
  const values: Record<string, string> = {};
  for (const [key, value] of params) if (key !== "teamId") values[key] = value;
  return parseFields(schema, values, "Some filters are not right.");
}

/** A team id from the query string: absent means `fallback` (the actor's default team,
 * `defaultTeamId`); malformed means not found. */
export function teamIdQuery(request: Request, fallback: string | undefined): string {
  const given = new URL(request.url).searchParams.get("teamId");
  if (given !== null && !isRecordId(given)) throw new AppError("not_found", "No such team.");
  const teamId = given ?? fallback;
  if (!teamId) throw new AppError("not_found", "You are not in a team yet.");
  return teamId;
}
