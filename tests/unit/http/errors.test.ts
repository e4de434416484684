// toResponse: a lost or refused database connection answers 503 with Retry-After and a sentence (not
// a 500); a value PostgreSQL cannot store answers 400; a version conflict answers 409, and a form gets
// the same sentence; anything else unexpected stays a generic 500.
import { describe, expect, it, vi } from "vitest";
import { isDatabaseUnavailable } from "@/lib/database-unavailable";
import { toResponse } from "@/lib/errors";
import { formError } from "@/lib/validation/form-state";

function named(name: string, message = "x", extra: Record<string, unknown> = {}): Error {
  const error = new Error(message);
  error.name = name;
  return Object.assign(error, extra);
}

describe("database outages", () => {
  it.each([
    [
      "Sequelize's refused connection",
      named("SequelizeConnectionRefusedError", "connect ECONNREFUSED 127.0.0.1:5432"),
    ],
    ["Sequelize's pool timeout", named("SequelizeConnectionAcquireTimeoutError")],
    [
      "a dropped connection mid-query",
      named("SequelizeDatabaseError", "Connection terminated unexpectedly", {
        parent: new Error("Connection terminated unexpectedly"),
      }),
    ],
    [
      "the server shutting down (57P01)",
      named("SequelizeDatabaseError", "terminating connection", {
        parent: Object.assign(new Error("x"), { code: "57P01" }),
      }),
    ],
    [
      "the server starting up (57P03)",
      Object.assign(new Error("the database system is starting up"), { code: "57P03" }),
    ],
    ["a socket reset", Object.assign(new Error("read ECONNRESET"), { code: "ECONNRESET" })],
  ])("%s answers 503 with Retry-After", async (_name, error) => {
    const spy = vi.spyOn(console, "error").mockImplementation(() => {});
    expect(isDatabaseUnavailable(error)).toBe(true);
    const response = toResponse(error);
    spy.mockRestore();
    expect(response.status).toBe(503);
    expect(Number(response.headers.get("retry-after"))).toBeGreaterThan(0);
    const body = (await response.json()) as { error: { code: string; message: string } };
    expect(body.error.code).toBe("unavailable");
    expect(body.error.message).toMatch(/^The database is unreachable.*\.$/);
  });

  it("a constraint violation or a bug is not mistaken for an outage", () => {
    expect(
      isDatabaseUnavailable(
        named("SequelizeUniqueConstraintError", "duplicate key", {
          parent: Object.assign(new Error("x"), { code: "23505" }),
        }),
      ),
    ).toBe(false);
    expect(isDatabaseUnavailable(new TypeError("undefined is not a function"))).toBe(false);
    const spy = vi.spyOn(console, "error").mockImplementation(() => {});
    expect(toResponse(new TypeError("boom")).status).toBe(500);
    spy.mockRestore();
  });

  it("a value the database cannot store answers 400", () => {
    const error = named("SequelizeDatabaseError", "invalid byte sequence", {
      parent: Object.assign(new Error("x"), { code: "22021" }),
    });
    expect(toResponse(error).status).toBe(400);
  });
});

describe("version conflicts", () => {
  it("Sequelize's optimistic-lock error is a 409 conflict, and the same sentence in a form", async () => {
    const stale = named(
      "SequelizeOptimisticLockError",
      "Attempting to update a stale model instance",
    );
    const response = toResponse(stale);
    expect(response.status).toBe(409);
    const body = (await response.json()) as { error: { code: string; message: string } };
    expect(body.error.code).toBe("conflict");
    expect(body.error.message).toMatch(/^Someone else changed this record first/);
    expect(body.error.message).not.toMatch(/stale model/);
    expect(formError(stale)).toEqual({ message: body.error.message, fieldErrors: undefined });
  });

  it("a form re-throws what is not expected, to the error boundary", () => {
    const bug = new TypeError("boom");
    expect(() => formError(bug)).toThrow(bug);
  });
});
