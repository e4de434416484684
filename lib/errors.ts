// Typed application errors and the single place that turns any error into an HTTP reply,
// so that database details never reach a client.
import { isDatabaseUnavailable } from "@/lib/database-unavailable";

export type ErrorCode =
  | "unauthenticated"
  | "forbidden"
  | "not_found"
  | "validation"
  | "conflict"
  | "rate_limited"
  | "unprocessable"
  | "too_large"
  | "timeout"
  | "unavailable";

const STATUS: Record<ErrorCode, number> = {
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  validation: 400,
  conflict: 409,
  rate_limited: 429,
  unprocessable: 422,
  too_large: 413,
  timeout: 408,
  /** Busy or out of reach for a moment (a full work queue, the database gone): retry after Retry-After. */
  unavailable: 503,
};

export type FieldErrors = Record<string, string[]>;

export class AppError extends Error {
  readonly code: ErrorCode;
  readonly fieldErrors?: FieldErrors;
  readonly retryAfterSeconds?: number;

  constructor(
    code: ErrorCode,
    message: string,
    extra: { fieldErrors?: FieldErrors; retryAfterSeconds?: number } = {},
  ) {
    super(message);
    this.name = "AppError";
    this.code = code;
    this.fieldErrors = extra.fieldErrors;
    this.retryAfterSeconds = extra.retryAfterSeconds;
  }

  get status(): number {
    return STATUS[this.code];
  }
}

export const notFound = (
  what = "Not found: it does not exist, or it belongs to a team you are not in.",
) => new AppError("not_found", what);
export const forbidden = (why = "You are not allowed to do that.") =>
  new AppError("forbidden", why);
export const unauthenticated = () => new AppError("unauthenticated", "Sign in first.");

/** How long a client should wait before trying again while the database is unreachable. */
export const DATABASE_RETRY_AFTER_SECONDS = 15;
export const DATABASE_UNAVAILABLE_MESSAGE =
  "The database is unreachable at the moment, so nothing was read or saved. Try again in a few seconds.";

/**
 * PostgreSQL's SQLSTATEs for a value it cannot take: 22021 (NUL or bad UTF-8), 22P05 (untranslatable,
 * e.g. \u0000 in jsonb), 22008 and 22007 (date out of range or malformed), 22003 (number out of range).
 */
const UNSTORABLE_VALUE_CODES = new Set(["22021", "22P05", "22008", "22007", "22003"]);

function isUnstorableValue(error: unknown): boolean {
  if (!(error instanceof Error) || error.name !== "SequelizeDatabaseError") return false;
  const code = (error as { parent?: { code?: unknown } }).parent?.code;
  return typeof code === "string" && UNSTORABLE_VALUE_CODES.has(code);
}

/**
 * The expected errors as AppErrors: an AppError itself, and Sequelize's optimistic-lock error (an
 * instance saved from a stale read of a versioned model) as a conflict. Anything else is undefined:
 * the caller treats it as unexpected. The one place that maps a version conflict to its answer, for
 * route replies (`toResponse`) and server actions' form states (`formError`) alike.
 */
export function expectedError(error: unknown): AppError | undefined {
  if (error instanceof AppError) return error;
  if (error instanceof Error && error.name === "SequelizeOptimisticLockError") {
    return new AppError(
      "conflict",
      "Someone else changed this record first. Reload and try again.",
    );
  }
  return undefined;
}

/** Maps any thrown value to a JSON reply; unknown errors are logged and answered generically. */
export function toResponse(thrown: unknown): Response {
  const error = expectedError(thrown) ?? thrown;
  if (error instanceof AppError) {
    const headers: Record<string, string> = {};
    if (error.retryAfterSeconds) headers["Retry-After"] = String(error.retryAfterSeconds);
    return Response.json(
      { error: { code: error.code, message: error.message, fieldErrors: error.fieldErrors } },
      { status: error.status, headers },
    );
  }
  if (isUnstorableValue(error)) {
    // The schemas refuse these first (lib/validation/text.ts, bounded dates); this is the safety net.
    return Response.json(
      {
        error: {
          code: "validation",
          message:
            "The request holds a value that cannot be stored (a control character, broken Unicode or a date out of range). Nothing was saved.",
        },
      },
      { status: 400 },
    );
  }
  if (isDatabaseUnavailable(error)) {
    console.error("The database is unreachable:", error instanceof Error ? error.message : error);
    return Response.json(
      { error: { code: "unavailable", message: DATABASE_UNAVAILABLE_MESSAGE } },
      { status: 503, headers: { "Retry-After": String(DATABASE_RETRY_AFTER_SECONDS) } },
    );
  }
  console.error(error);
  return Response.json(
    {
      error: {
        code: "internal",
        message: "Something went wrong on the server. Nothing was saved.",
      },
    },
    { status: 500 },
  );
}
