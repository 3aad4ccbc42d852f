import "server-only";
import net from "node:net";

/** The address used when a request's origin cannot be told; every such request shares one throttle budget. */
export const UNKNOWN_ADDRESS = "unknown";

/** A plain IP address with an IPv4-mapped IPv6 prefix, brackets and a port removed, or null when it is none. */
export function normaliseAddress(raw: string | undefined | null): string | null {
  let a = (raw ?? "").trim();
  if (a.startsWith("[")) a = a.slice(1, a.indexOf("]") > 0 ? a.indexOf("]") : undefined);
  else if (/^\d{1,3}(\.\d{1,3}){3}:\d+$/.test(a)) a = a.slice(0, a.lastIndexOf(":"));
  a = a.toLowerCase();
  if (a.startsWith("::ffff:") && net.isIPv4(a.slice(7))) a = a.slice(7);
  return net.isIP(a) === 0 ? null : a;
}

/**
 * Turns a TRUSTED_PROXIES list ("10.0.0.5, 172.16.0.0/12, ::1") into a test; entries that are not an
 * address or a CIDR range are refused, so a typo cannot silently trust nobody (or everybody).
 */
export function trustedProxyMatcher(entries: string[]): (address: string) => boolean {
  const list = new net.BlockList();
  for (const entry of entries) {
    const [base, prefix, extra] = entry.split("/");
    const address = normaliseAddress(base);
    const family = address && net.isIPv6(address) ? "ipv6" : "ipv4";
    const bits = prefix === undefined ? null : Number(prefix);
    if (!address || extra !== undefined || (bits !== null && !(Number.isInteger(bits) && bits >= 0 && bits <= (family === "ipv6" ? 128 : 32)) || prefix === "")) {
      throw new Error(`"${entry}" is not an IP address or a CIDR range`);
    }
    if (bits === null) list.addAddress(address, family);
    else list.addSubnet(address, bits, family);
  }
  return (address) => list.check(address, net.isIPv6(address) ? "ipv6" : "ipv4");
}

/**
 * The client behind a connection. The connection's own address is the client unless it is a trusted
 * proxy; then X-Forwarded-For is read from the right (each proxy appends the address it was reached
 * from), passing only over trusted proxies. Entries left of the first untrusted one were written by the
 * client and are never believed. Next's own server keeps a client-sent X-Forwarded-For as it is, so the
 * header alone says nothing about who connected.
 */
export function clientAddressFrom(
  peer: string | undefined,
  forwardedFor: string | string[] | undefined,
  isTrustedProxy: (address: string) => boolean,
): string {
  let client = normaliseAddress(peer);
  if (!client) return UNKNOWN_ADDRESS;
  const hops = (Array.isArray(forwardedFor) ? forwardedFor.join(",") : (forwardedFor ?? "")).split(",");
  for (let i = hops.length - 1; i >= 0 && isTrustedProxy(client); i -= 1) {
    const hop = normaliseAddress(hops[i]);
    // A hop that is no address was not written by a proxy we trust; the last trusted hop is all we know.
    if (!hop) break;
    client = hop;
  }
  return client;
}
