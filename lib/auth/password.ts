// Password hashing (argon2id above the OWASP minimum) and the password policy.
import argon2 from "argon2";

// OWASP Password Storage Cheat Sheet: argon2id with at least 19 MiB memory, 2 iterations,
// parallelism 1. We use 64 MiB and 3 iterations.
const HASH_OPTIONS = {
  type: argon2.argon2id,
  memoryCost: 65_536,
  timeCost: 3,
  parallelism: 1,
} as const;

export const PASSWORD_MIN_LENGTH = 12;
export const PASSWORD_MAX_LENGTH = 256;

const COMMON_PASSWORDS = new Set([
  "password1234",
  "123456789012",
  "qwertyuiopas",
  "passwordpassword",
  "letmeinletmein",
  "iloveyou1234",
  "administrator",
  "welcome12345",
]);

/** Returns the reasons a password is refused, or an empty list when it is acceptable. */
export function passwordProblems(password: string, email?: string): string[] {
  const problems: string[] = [];
  if (password.length < PASSWORD_MIN_LENGTH) {
    problems.push(
      `Use at least ${PASSWORD_MIN_LENGTH} characters; a few words together work well.`,
    );
  }
  if (password.length > PASSWORD_MAX_LENGTH) {
    problems.push(`Use at most ${PASSWORD_MAX_LENGTH} characters.`);
  }
  if (COMMON_PASSWORDS.has(password.toLowerCase())) problems.push("This password is too common.");
  if (email && password.toLowerCase() === email.toLowerCase()) {
    problems.push("The password must not be your e-mail address.");
  }
  if (/^(.)\1+$/.test(password)) problems.push("The password must not be one repeated character.");
  return problems;
}

export function hashPassword(password: string): Promise<string> {
  return argon2.hash(password, HASH_OPTIONS);
}

export async function verifyPassword(hash: string, password: string): Promise<boolean> {
  try {
    return await argon2.verify(hash, password);
  } catch {
    return false;
  }
}

// A hash to verify against when the account does not exist, so that timing does not reveal it.
let dummyHash: Promise<string> | undefined;
export function dummyPasswordHash(): Promise<string> {
  dummyHash ??= hashPassword("emberline-no-such-account");
  return dummyHash;
}
