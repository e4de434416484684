// The one reader of a request's client address, for throttling and the audit trail. Forwarded
// headers (X-Forwarded-For, X-Real-IP) are believed only when the direct peer is a configured
// proxy (TRUSTED_PROXIES); otherwise anyone could name any address and rotate past the throttle.
import net from "node:net";

/**
 * Set on every incoming request by `lib/http/peer-address-hook.ts` from the socket itself,
 * overwriting whatever a client sent under this name, so it always names the direct peer.
 */
export const PEER_ADDRESS_HEADER = "x-emberline-peer-address";

/** Where the peer is unknown (no hook installed): every such client shares this one key. */
export const UNKNOWN_ADDRESS = "unknown";

/** A list of trusted proxies: addresses and CIDR ranges, IPv4 and IPv6. */
export interface TrustedProxies {
  blockList: net.BlockList;
  /** The entries as written, for messages. */
  entries: readonly string[];
}

/**
 * Parses a comma list such as `127.0.0.1, 10.0.0.0/8, ::1, fd00::/8`. Throws a RangeError that
 * names the first entry that is neither an address nor a CIDR range, so a typo stops the start.
 */
export function parseTrustedProxies(list: string | undefined): TrustedProxies {
  const blockList = new net.BlockList();
  const entries = (list ?? "")
    .split(",")
    .map((entry) => entry.trim())
    .filter(Boolean);
  for (const entry of entries) {
    const [address, prefix, extra] = entry.split("/");
    const family = net.isIP(address);
    if (!family || extra !== undefined)
      throw new RangeError(`TRUSTED_PROXIES: "${entry}" is not an address or CIDR range.`);
    const type = family === 4 ? "ipv4" : "ipv6";
    if (prefix === undefined) {
      blockList.addAddress(address, type);
      continue;
    }
    const bits = Number(prefix);
    if (!/^\d{1,3}$/.test(prefix) || bits > (family === 4 ? 32 : 128)) {
      throw new RangeError(`TRUSTED_PROXIES: "${entry}" has a prefix length out of range.`);
    }
    blockList.addSubnet(address, bits, type);
  }
  return { blockList, entries };
}

/**
 * An address as a plain IP: IPv4-mapped IPv6 (`::ffff:10.0.0.1`) becomes IPv4, a port after an
 * IPv4 address or a bracketed IPv6 address is dropped, an IPv6 zone is dropped; null when the
 * text is not an address at all.
 */
export function normaliseAddress(text: string | null | undefined): string | null {
  let value = (text ?? "").trim();
  if (!value) return null;
  const bracketed = /^\[([^\]]+)\](?::\d+)?$/.exec(value);
  if (bracketed) value = bracketed[1];
  else if (/^\d{1,3}(\.\d{1,3}){3}:\d+$/.test(value))
    value = value.slice(0, value.lastIndexOf(":"));
  value = value.replace(/%.*$/, "");
  const mapped = /^::ffff:(\d{1,3}(\.\d{1,3}){3})$/i.exec(value);
  if (mapped) value = mapped[1];
  const family = net.isIP(value);
  if (!family) return null;
  return family === 6 ? value.toLowerCase() : value;
}

function isTrusted(address: string, trusted: TrustedProxies): boolean {
  return trusted.blockList.check(address, net.isIP(address) === 4 ? "ipv4" : "ipv6");
}

/**
 * The client's address from the direct peer and the forwarded headers. When the peer is a trusted
 * proxy, X-Forwarded-For is read from the right (the entry the nearest proxy appended) past every
 * further trusted proxy; the first untrusted entry is the client. An entry that is not an address
 * stops the walk at the last address known to be good. Without trust, the peer is the client.
 */
export function resolveClientAddress(input: {
  peer: string | null | undefined;
  forwardedFor?: string | null;
  realIp?: string | null;
  trusted: TrustedProxies;
}): string {
  const peer = normaliseAddress(input.peer);
  if (!peer) return UNKNOWN_ADDRESS;
  if (!isTrusted(peer, input.trusted)) return peer;
  const hops = (input.forwardedFor ?? "")
    .split(",")
    .map((hop) => hop.trim())
    .filter(Boolean);
  if (hops.length === 0) return normaliseAddress(input.realIp) ?? peer;
  let client = peer;
  for (let i = hops.length - 1; i >= 0; i--) {
    const hop = normaliseAddress(hops[i]);
    if (!hop) return client;
    client = hop;
    if (!isTrusted(hop, input.trusted)) return hop;
  }
  return client;
}

let configured: TrustedProxies | undefined;

function trustedProxies(): TrustedProxies {
  configured ??= parseTrustedProxies(process.env.TRUSTED_PROXIES);
  return configured;
}

/**
 * The client address of a request: pass `request.headers` in a route handler or
 * `await headers()` in a server action.
 */
export function clientAddress(
  headers: Headers,
  trusted: TrustedProxies = trustedProxies(),
): string {
  return resolveClientAddress({
    peer: headers.get(PEER_ADDRESS_HEADER),
    forwardedFor: headers.get("x-forwarded-for"),
    realIp: headers.get("x-real-ip"),
    trusted,
  });
}
