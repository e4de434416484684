// The audit trail's filters as they arrive in a query string (API and page alike): team, person,
// entity, action (exact, or a prefix ending in "."), a range of whole UTC days, a cursor, a page size.
import { z } from "zod";
import { text } from "./text";

export const AUDIT_PAGE_MAX = 200;
export const AUDIT_PAGE_DEFAULT = 50;

/** Blank query values mean "no filter". */
function blankIsAbsent<T extends z.ZodType>(schema: T) {
  return z.preprocess((v) => {
    if (typeof v !== "string") return v;
    const trimmed = v.trim();
    return trimmed === "" ? undefined : trimmed;
  }, schema);
}

/** Days the trail can hold: from the Unix epoch to the end of 2999 (the day after "to" must still be a date). */
const FIRST_YEAR = 1970;
const LAST_YEAR = 2999;

function isCalendarDay(value: string): boolean {
  const date = new Date(`${value}T00:00:00Z`);
  return !Number.isNaN(date.getTime()) && date.toISOString().slice(0, 10) === value;
}

const day = (what: string) =>
  text()
    .regex(/^\d{4}-\d{2}-\d{2}$/, `Give the ${what} date as YYYY-MM-DD.`)
    .refine(isCalendarDay, `The ${what} date is not a day of the calendar.`)
    .refine((value) => {
      const year = Number(value.slice(0, 4));
      return year >= FIRST_YEAR && year <= LAST_YEAR;
    }, `The ${what} date must fall between ${FIRST_YEAR} and ${LAST_YEAR}.`);

export const auditQuerySchema = z
  .object({
    teamId: blankIsAbsent(z.uuid("Choose a team.").optional()),
    actorId: blankIsAbsent(z.uuid("Choose a person from the list.").optional()),
    entity: blankIsAbsent(
      text()
        .max(64, "Use at most 64 characters.")
        .regex(/^[a-z][a-z0-9_]*$/, "An entity is a lower-case name such as run or line_release.")
        .optional(),
    ),
    entityId: blankIsAbsent(text().max(200, "Use at most 200 characters.").optional()),
    action: blankIsAbsent(
      text()
        .max(100, "Use at most 100 characters.")
        .regex(
          /^[A-Za-z][A-Za-z0-9_]*(\.[A-Za-z0-9_]+)*\.?$/,
          "An action looks like run.create, or run. for every run action.",
        )
        .optional(),
    ),
    from: blankIsAbsent(day("first").optional()),
    to: blankIsAbsent(day("last").optional()),
    cursor: blankIsAbsent(
      text()
        .regex(/^\d{1,18}$/, "The cursor is not one this server gave out.")
        .optional(),
    ),
    limit: blankIsAbsent(
      z.coerce
        .number({ error: "The page size is a whole number." })
        .int("The page size is a whole number.")
        .min(1, "Ask for at least one event.")
        .max(AUDIT_PAGE_MAX, `Ask for at most ${AUDIT_PAGE_MAX} events a page.`)
        .optional(),
    ),
    format: blankIsAbsent(
      z.enum(["json", "csv"], { error: "The format is json or csv." }).optional(),
    ),
  })
  .refine((q) => !q.from || !q.to || q.from <= q.to, {
    path: ["to"],
    message: "The last day comes before the first.",
  })
  .refine((q) => !q.entityId || q.entity, {
    path: ["entity"],
    message: "Say which kind of record the id belongs to.",
  });

export type AuditQueryInput = z.infer<typeof auditQuerySchema>;

/** The filter fields that shape a trail (everything except paging and format), for links and the CSV. */
export const AUDIT_FILTER_KEYS = ["actorId", "entity", "entityId", "action", "from", "to"] as const;
export type AuditFilterKey = (typeof AUDIT_FILTER_KEYS)[number];

/** The query string of a filtered trail, blank fields left out. */
export function auditSearchParams(
  filters: Partial<Record<AuditFilterKey | "teamId" | "format", string | undefined>>,
): URLSearchParams {
  const params = new URLSearchParams();
  for (const key of ["teamId", ...AUDIT_FILTER_KEYS, "format"] as const) {
    const value = filters[key];
    if (value) params.set(key, value);
  }
  return params;
}
