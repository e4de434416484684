// Tells a lost or refused database connection apart from a real failure, by the error's name and
// code alone (no import of Sequelize or pg, so lib/errors.ts stays importable anywhere).

/** Sequelize's connection errors: ConnectionError and its subclasses, and the pool's acquire timeout. */
const SEQUELIZE_CONNECTION_NAMES = new Set([
  "SequelizeConnectionError",
  "SequelizeConnectionRefusedError",
  "SequelizeConnectionTimedOutError",
  "SequelizeConnectionAcquireTimeoutError",
  "SequelizeHostNotFoundError",
  "SequelizeHostNotReachableError",
  "SequelizeInvalidConnectionError",
  "SequelizeAccessDeniedError",
]);

/** Socket errors of a connection that is gone or cannot be opened. */
const SOCKET_CODES = new Set([
  "ECONNREFUSED",
  "ECONNRESET",
  "EPIPE",
  "ETIMEDOUT",
  "EHOSTUNREACH",
  "ENOTFOUND",
  "EAI_AGAIN",
]);

/**
 * PostgreSQL's SQLSTATEs for "the server is going away or not there yet": class 08 (connection
 * exception), 57P01 admin_shutdown, 57P02 crash_shutdown, 57P03 cannot_connect_now.
 */
function isUnavailableSqlState(code: string): boolean {
  return code.startsWith("08") || code === "57P01" || code === "57P02" || code === "57P03";
}

/** pg's own messages when a connection drops mid-query or the client was ended. */
const LOST_CONNECTION_MESSAGE =
  /Connection terminated|Client has encountered a connection error|connection is closed|Client was closed/i;

export function isDatabaseUnavailable(error: unknown, depth = 0): boolean {
  if (!error || typeof error !== "object" || depth > 4) return false;
  const { name, code, message } = error as { name?: unknown; code?: unknown; message?: unknown };
  if (typeof name === "string" && SEQUELIZE_CONNECTION_NAMES.has(name)) return true;
  if (
    typeof code === "string" &&
    (SOCKET_CODES.has(code) || (/^[0-9A-Z]{5}$/.test(code) && isUnavailableSqlState(code)))
  )
    return true;
  if (typeof message === "string" && LOST_CONNECTION_MESSAGE.test(message)) return true;
  // Sequelize wraps the driver's error in `parent`/`original`; AggregateError lists several.
  const wrapped = error as {
    parent?: unknown;
    original?: unknown;
    cause?: unknown;
    errors?: unknown;
  };
  if (
    [wrapped.parent, wrapped.original, wrapped.cause].some((inner) =>
      isDatabaseUnavailable(inner, depth + 1),
    )
  )
    return true;
  return (
    Array.isArray(wrapped.errors) &&
    wrapped.errors.some((inner) => isDatabaseUnavailable(inner, depth + 1))
  );
}
