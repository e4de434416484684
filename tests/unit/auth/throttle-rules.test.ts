// The throttle's delay rule: per (account, address) pair, doubling, capped; per-address cap.
import { describe, expect, it } from "vitest";
import {
  THROTTLE,
  describeWait,
  pairDelaySeconds,
  passwordCheckWaitSeconds,
  throttleAddressKey,
} from "@/lib/auth/throttle-rules";

const now = new Date("2026-03-01T12:00:00Z");
const ago = (seconds: number) => new Date(now.getTime() - seconds * 1000);

describe("pairDelaySeconds", () => {
  it("lets the first three failures through, then doubles from 1 s up to 15 minutes", () => {
    expect([0, 1, 2, 3, 4, 5, 6, 7, 8].map(pairDelaySeconds)).toEqual([
      0, 0, 0, 1, 2, 4, 8, 16, 32,
    ]);
    expect(pairDelaySeconds(12)).toBe(512);
    expect(pairDelaySeconds(13)).toBe(900);
    expect(pairDelaySeconds(1000)).toBe(THROTTLE.maxDelaySeconds);
  });
});

describe("passwordCheckWaitSeconds", () => {
  const quiet = {
    pairFailures: 0,
    lastPairFailureAt: null,
    addressFailureTimes: [],
    knownAddress: false,
  };

  it("is 0 for a pair with no failures", () => {
    expect(passwordCheckWaitSeconds(quiet, now)).toBe(0);
  });

  it("waits out the pair's delay counted from its newest failure", () => {
    // 6 failures → 8 s after the last one; 3 s have passed.
    expect(
      passwordCheckWaitSeconds({ ...quiet, pairFailures: 6, lastPairFailureAt: ago(3) }, now),
    ).toBe(5);
    expect(
      passwordCheckWaitSeconds({ ...quiet, pairFailures: 6, lastPairFailureAt: ago(9) }, now),
    ).toBe(0);
  });

  it("stops an address at 20 failures in 15 minutes until the oldest counted one leaves the window", () => {
    const times = Array.from({ length: 20 }, (_, i) => ago(10 + i * 30)); // newest 10 s ago, oldest 580 s ago
    expect(passwordCheckWaitSeconds({ ...quiet, addressFailureTimes: times }, now)).toBe(
      15 * 60 - 580,
    );
    expect(
      passwordCheckWaitSeconds({ ...quiet, addressFailureTimes: times.slice(0, 19) }, now),
    ).toBe(0);
  });

  it("spares an address the account knows from the address cap, but not from the pair's delay", () => {
    const times = Array.from({ length: 20 }, () => ago(5));
    expect(
      passwordCheckWaitSeconds({ ...quiet, addressFailureTimes: times, knownAddress: true }, now),
    ).toBe(0);
    expect(
      passwordCheckWaitSeconds(
        {
          pairFailures: 4,
          lastPairFailureAt: ago(1),
          addressFailureTimes: times,
          knownAddress: true,
        },
        now,
      ),
    ).toBe(1);
  });
});

describe("describeWait", () => {
  it.each([
    [1, "1 second"],
    [45, "45 seconds"],
    [60, "1 minute"],
    [61, "2 minutes"],
    [900, "15 minutes"],
  ])("%i → %s", (seconds, words) => {
    expect(describeWait(seconds)).toBe(words);
  });
});

describe("throttleAddressKey", () => {
  it.each([
    ["198.51.100.7", "198.51.100.7"],
    ["2001:db8:1:2:aaaa:bbbb:cccc:dddd", "2001:db8:1:2::/64"],
    ["2001:db8:1:2::1", "2001:db8:1:2::/64"],
    ["2001:0DB8:0001:0002::ff", "2001:db8:1:2::/64"],
    ["2001:db8::1", "2001:db8:0:0::/64"],
    ["::1", "0:0:0:0::/64"],
    ["unknown", "unknown"],
  ])("%s → %s", (address, key) => {
    expect(throttleAddressKey(address)).toBe(key);
  });

  it("puts every address of one /64 under one key and the next /64 under another", () => {
    expect(throttleAddressKey("2001:db8:5:6:1::")).toBe(
      throttleAddressKey("2001:db8:5:6:ffff:1:2:3"),
    );
    expect(throttleAddressKey("2001:db8:5:7::1")).not.toBe(throttleAddressKey("2001:db8:5:6::1"));
  });
});
