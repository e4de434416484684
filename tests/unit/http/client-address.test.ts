// The client-address reader: forwarded headers count only from configured proxies (CIDRs, IPv4/6).
import { describe, expect, it } from "vitest";
import {
  PEER_ADDRESS_HEADER,
  UNKNOWN_ADDRESS,
  clientAddress,
  normaliseAddress,
  parseTrustedProxies,
  resolveClientAddress,
} from "@/lib/http/client-address";

const proxies = parseTrustedProxies("127.0.0.1, 10.0.0.0/8, fd00::/8");
const none = parseTrustedProxies(undefined);

describe("parseTrustedProxies", () => {
  it("accepts addresses and CIDR ranges of both families, with spaces and empty entries", () => {
    expect(parseTrustedProxies(" 192.168.0.0/16 ,, ::1 , 2001:db8::/32").entries).toEqual([
      "192.168.0.0/16",
      "::1",
      "2001:db8::/32",
    ]);
  });

  it.each(["localhost", "10.0.0.0/33", "10.0.0.0/x", "::1/129", "1.2.3.4/8/8", "300.1.1.1"])(
    "refuses %s with a RangeError that names it",
    (entry) => {
      expect(() => parseTrustedProxies(`127.0.0.1,${entry}`)).toThrow(RangeError);
      expect(() => parseTrustedProxies(entry)).toThrow(entry);
    },
  );
});

describe("normaliseAddress", () => {
  it.each([
    ["::ffff:10.1.2.3", "10.1.2.3"],
    ["10.1.2.3:5123", "10.1.2.3"],
    ["[2001:DB8::1]:443", "2001:db8::1"],
    ["fe80::1%eth0", "fe80::1"],
    [" 192.0.2.7 ", "192.0.2.7"],
  ])("%s → %s", (text, expected) => {
    expect(normaliseAddress(text)).toBe(expected);
  });

  it.each(["", "unknown", "evil.example", "1.2.3", null, undefined])(
    "%s is not an address",
    (text) => {
      expect(normaliseAddress(text)).toBeNull();
    },
  );
});

describe("resolveClientAddress", () => {
  it("ignores X-Forwarded-For and X-Real-IP from an untrusted peer", () => {
    expect(
      resolveClientAddress({
        peer: "203.0.113.9",
        forwardedFor: "198.51.100.1",
        realIp: "198.51.100.2",
        trusted: proxies,
      }),
    ).toBe("203.0.113.9");
  });

  it("ignores them when no proxy is configured at all, even from loopback", () => {
    expect(
      resolveClientAddress({ peer: "127.0.0.1", forwardedFor: "198.51.100.1", trusted: none }),
    ).toBe("127.0.0.1");
  });

  it("takes the entry the trusted proxy appended, not the one a client wrote on the left", () => {
    // The client sent "X-Forwarded-For: 1.1.1.1"; the proxy appended the address it saw.
    expect(
      resolveClientAddress({
        peer: "127.0.0.1",
        forwardedFor: "1.1.1.1, 198.51.100.4",
        trusted: proxies,
      }),
    ).toBe("198.51.100.4");
  });

  it("walks past a chain of trusted proxies inside a CIDR range", () => {
    expect(
      resolveClientAddress({
        peer: "10.0.0.2",
        forwardedFor: "1.1.1.1, 198.51.100.4, 10.9.8.7",
        trusted: proxies,
      }),
    ).toBe("198.51.100.4");
  });

  it("uses the leftmost entry when every hop is a trusted proxy", () => {
    expect(
      resolveClientAddress({
        peer: "127.0.0.1",
        forwardedFor: "10.1.1.1, 10.2.2.2",
        trusted: proxies,
      }),
    ).toBe("10.1.1.1");
  });

  it("stops at a hop that is not an address and keeps the last good one", () => {
    expect(
      resolveClientAddress({
        peer: "127.0.0.1",
        forwardedFor: "198.51.100.4, <script>",
        trusted: proxies,
      }),
    ).toBe("127.0.0.1");
  });

  it("uses X-Real-IP from a trusted proxy that sends no X-Forwarded-For", () => {
    expect(
      resolveClientAddress({ peer: "::ffff:127.0.0.1", realIp: "198.51.100.8", trusted: proxies }),
    ).toBe("198.51.100.8");
  });

  it("trusts IPv6 proxies by range", () => {
    expect(
      resolveClientAddress({ peer: "fd12::3", forwardedFor: "2001:db8::5", trusted: proxies }),
    ).toBe("2001:db8::5");
    expect(
      resolveClientAddress({ peer: "2001:db8::9", forwardedFor: "2001:db8::5", trusted: proxies }),
    ).toBe("2001:db8::9");
  });

  it("names one shared unknown address when the peer is missing", () => {
    expect(
      resolveClientAddress({ peer: undefined, forwardedFor: "198.51.100.4", trusted: proxies }),
    ).toBe(UNKNOWN_ADDRESS);
  });
});

describe("clientAddress(headers)", () => {
  it("reads the peer header the server hook sets and the forwarded headers", () => {
    const headers = new Headers({
      [PEER_ADDRESS_HEADER]: "127.0.0.1",
      "x-forwarded-for": "198.51.100.4",
    });
    expect(clientAddress(headers, proxies)).toBe("198.51.100.4");
    expect(clientAddress(headers, none)).toBe("127.0.0.1");
  });

  it("rotating X-Forwarded-For from an untrusted peer always yields the same address", () => {
    const seen = new Set(
      ["1.1.1.1", "2.2.2.2", "3.3.3.3, 4.4.4.4", ""].map((forwarded) =>
        clientAddress(
          new Headers({ [PEER_ADDRESS_HEADER]: "203.0.113.50", "x-forwarded-for": forwarded }),
          proxies,
        ),
      ),
    );
    expect([...seen]).toEqual(["203.0.113.50"]);
  });
});
