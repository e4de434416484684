// A password-reset request answers after the same work whether or not the address has an account:
// the account lookup and the mail run in the background. Checked on the service with its database
// and mail stubbed (the one service test in the unit project: timing is not something to assert).
import { beforeEach, describe, expect, it, vi } from "vitest";

const calls: string[] = [];
const never = () => new Promise<never>(() => {});

vi.mock("@/models", () => ({
  SignInAttempt: {
    count: vi.fn(async () => {
      calls.push("count");
      return 0;
    }),
    create: vi.fn(async (row: { kind: string }) => {
      calls.push(`create:${row.kind}`);
      return row;
    }),
  },
  // The background work: a transaction that never finishes, so nothing after it can be awaited.
  sequelize: {
    transaction: vi.fn(() => {
      calls.push("transaction");
      return never();
    }),
  },
  User: { findOne: vi.fn(never) },
  AccessToken: {},
  Membership: {},
  PasswordResetToken: {},
  Team: {},
}));
vi.mock("@/lib/mail/send-mail", () => ({ sendMail: vi.fn(never) }));
vi.mock("@/lib/services/audit", () => ({ recordAudit: vi.fn() }));
vi.mock("@/lib/services/sessions", () => ({ revokeSessionsOf: vi.fn() }));

const { requestPasswordReset } = await import("@/lib/services/accounts");

beforeEach(() => {
  calls.length = 0;
});

describe("requestPasswordReset", () => {
  it("answers without waiting for the account lookup or the mail", async () => {
    // The background transaction never settles; the request must resolve all the same.
    await expect(
      requestPasswordReset({ email: "Someone@Example.org ", address: "192.0.2.1" }),
    ).resolves.toBeUndefined();
    // What the reply waited for: the address count and the record of the request; the lookup was only started.
    expect(calls).toEqual(["count", "create:reset_request", "transaction"]);
  });

  it("does exactly the same before answering for any address, known or not", async () => {
    await requestPasswordReset({ email: "chem@demo.emberline.example", address: "192.0.2.2" });
    const known = [...calls];
    calls.length = 0;
    await requestPasswordReset({ email: "nobody@nowhere.example", address: "192.0.2.2" });
    expect(calls).toEqual(known);
  });
});
