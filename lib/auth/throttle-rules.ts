// The throttle's rules, pure so they can be tested without a database. Password guessing is slowed
// per (account, address) pair by a delay that doubles with each failure, and capped per address;
// there is no lock on an account as such, so no number of failures from one address keeps the
// owner's correct password out from another. A completed password reset clears the account's
// delays (the CAPTCHA-free unlock), and an address the account has used lately is spared the
// per-address cap (an office behind one NAT address keeps working while a guesser there is slowed).

export const THROTTLE = {
  /** Failures of one (account, address) pair before any delay. */
  freeFailuresPerPair: 3,
  /** The delay after the first counted failure; it doubles with each further one. */
  firstDelaySeconds: 1,
  /** The longest delay between two attempts of one pair. */
  maxDelaySeconds: 15 * 60,
  /** How far back a pair's failures count (when nothing cleared them sooner). */
  pairMemoryHours: 24,
  /** Failures of one address, over every account, that stop its password checks for a while… */
  maxFailuresPerAddress: 20,
  /** …within this sliding window. */
  addressWindowMinutes: 15,
  /** An address where the account signed in or was unlocked within this many days is spared the address cap. */
  knownAddressDays: 30,
  /** Password-reset requests one address may make in an hour (beyond: 429). */
  resetRequestsPerAddressPerHour: 10,
  /** Reset mails one account receives in an hour (beyond: the request is answered alike, no mail). */
  resetMailsPerAccountPerHour: 3,
  /** Password checks one pair may have running at once (a burst waits for none: it is refused). */
  concurrentChecksPerPair: 1,
  /** Password checks one address may have running at once. */
  concurrentChecksPerAddress: 4,
} as const;

/** The wait after `failures` failures of a pair: 0 for the first few, then 1 s, 2 s, 4 s, … up to 15 min. */
export function pairDelaySeconds(failures: number): number {
  const counted = failures - THROTTLE.freeFailuresPerPair;
  if (counted < 0) return 0;
  return Math.min(THROTTLE.firstDelaySeconds * 2 ** counted, THROTTLE.maxDelaySeconds);
}

export interface PasswordCheckHistory {
  /** Failures of this (account, address) pair since the later of its last success and the account's last unlock. */
  pairFailures: number;
  /** When the newest of those failures happened. */
  lastPairFailureAt: Date | null;
  /** Times of this address's failures within the address window, newest first (at most the cap's count). */
  addressFailureTimes: readonly Date[];
  /** Whether the account signed in or was unlocked from this address lately (see knownAddressDays). */
  knownAddress: boolean;
}

/** Whole seconds to wait before this pair may check a password again; 0 when it may now. */
export function passwordCheckWaitSeconds(history: PasswordCheckHistory, now: Date): number {
  let waitMs = 0;
  const delayMs = pairDelaySeconds(history.pairFailures) * 1000;
  if (delayMs > 0 && history.lastPairFailureAt) {
    waitMs = Math.max(waitMs, history.lastPairFailureAt.getTime() + delayMs - now.getTime());
  }
  const windowMs = THROTTLE.addressWindowMinutes * 60_000;
  const cap = THROTTLE.maxFailuresPerAddress;
  if (!history.knownAddress && history.addressFailureTimes.length >= cap) {
    // The address may try again when the oldest of its newest `cap` failures leaves the window.
    const oldestCounted = history.addressFailureTimes[cap - 1];
    waitMs = Math.max(waitMs, oldestCounted.getTime() + windowMs - now.getTime());
  }
  return waitMs > 0 ? Math.ceil(waitMs / 1000) : 0;
}

/** "45 seconds", "1 minute", "15 minutes": a wait as a person would say it. */
export function describeWait(seconds: number): string {
  if (seconds < 60) return `${seconds} second${seconds === 1 ? "" : "s"}`;
  const minutes = Math.ceil(seconds / 60);
  return `${minutes} minute${minutes === 1 ? "" : "s"}`;
}

/**
 * The key an address is throttled under: an IPv4 address as it is, an IPv6 address by its /64
 * network (one subscriber usually holds a whole /64, and could otherwise rotate through it).
 */
export function throttleAddressKey(address: string): string {
  if (!address.includes(":") || address.includes(".")) return address;
  const [head, tail] = address.toLowerCase().split("::");
  const headParts = head ? head.split(":") : [];
  const tailParts = tail === undefined ? [] : tail ? tail.split(":") : [];
  const missing = 8 - headParts.length - tailParts.length;
  if (missing < 0 || (tail === undefined && missing !== 0)) return address;
  const groups = [...headParts, ...Array<string>(missing).fill("0"), ...tailParts];
  return `${groups
    .slice(0, 4)
    .map((group) => group.replace(/^0+(?=.)/, ""))
    .join(":")}::/64`;
}
