// Typed application errors and the single place that turns any error into an HTTP reply,
// so that database details never reach a client.
export type ErrorCode =
  | "unauthenticated"
  | "forbidden"
  | "not_found"
  | "validation"
  | "conflict"
  | "rate_limited"
  | "unprocessable"
  | "too_large"
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

export const notFound = (what = "Not found") => new AppError("not_found", what);
export const forbidden = (why = "You are not allowed to do that.") => new AppError("forbidden", why);
export const unauthenticated = () => new AppError("unauthenticated", "Sign in first.");

/** Maps any thrown value to a JSON reply; unknown errors are logged and answered generically. */
export function toResponse(error: unknown): Response {
  if (error instanceof AppError) {
    const headers: Record<string, string> = {};
    if (error.retryAfterSeconds) headers["Retry-After"] = String(error.retryAfterSeconds);
    return Response.json(
      { error: { code: error.code, message: error.message, fieldErrors: error.fieldErrors } },
      { status: error.status, headers },
    );
  }
  if (error instanceof Error && error.name === "SequelizeOptimisticLockError") {
    return Response.json(
      { error: { code: "conflict", message: "Someone else changed this record first. Reload and try again." } },
      { status: 409 },
    );
  }
  console.error(error);
  return Response.json(
    { error: { code: "internal", message: "Something went wrong on the server. Nothing was saved." } },
    { status: 500 },
  );
}
