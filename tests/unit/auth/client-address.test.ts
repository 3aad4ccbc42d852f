import { describe, expect, it } from "vitest";
import { clientAddressFrom, normaliseAddress, trustedProxyMatcher, UNKNOWN_ADDRESS } from "@/server/auth/client-address";

const nobody = trustedProxyMatcher([]);
const proxies = trustedProxyMatcher(["10.0.0.5", "172.16.0.0/12", "::1"]);

describe("client address for per-address limits", () => {
  it("is the connection's address when nobody is trusted, whatever X-Forwarded-For says", () => {
    expect(clientAddressFrom("203.0.113.9", undefined, nobody)).toBe("203.0.113.9");
    expect(clientAddressFrom("203.0.113.9", "198.51.100.1", nobody)).toBe("203.0.113.9");
    expect(clientAddressFrom("203.0.113.9", "198.51.100.1, 10.0.0.5", nobody)).toBe("203.0.113.9");
    expect(clientAddressFrom("::ffff:203.0.113.9", ["1.1.1.1", "2.2.2.2"], nobody)).toBe("203.0.113.9");
  });

  it("behind a trusted proxy, is the rightmost untrusted entry: what a client writes to the left is never believed", () => {
    expect(clientAddressFrom("10.0.0.5", "198.51.100.7", proxies)).toBe("198.51.100.7");
    // The client forged "1.2.3.4"; the proxy appended the address it really came from.
    expect(clientAddressFrom("10.0.0.5", "1.2.3.4, 198.51.100.7", proxies)).toBe("198.51.100.7");
    // Two trusted proxies in a row are passed over.
    expect(clientAddressFrom("10.0.0.5", "1.2.3.4, 198.51.100.7, 172.20.1.1", proxies)).toBe("198.51.100.7");
    expect(clientAddressFrom("::1", "2001:DB8::1", proxies)).toBe("2001:db8::1");
    // A proxy that sent no header: the proxy itself is all we know.
    expect(clientAddressFrom("10.0.0.5", undefined, proxies)).toBe("10.0.0.5");
    // Garbage where an address should be stops the walk at the last trusted hop.
    expect(clientAddressFrom("10.0.0.5", "198.51.100.7, not-an-address", proxies)).toBe("10.0.0.5");
    expect(clientAddressFrom("10.0.0.5", "evil, 172.16.0.9", proxies)).toBe("172.16.0.9");
  });

  it("is the shared unknown address only when the connection has none", () => {
    expect(clientAddressFrom(undefined, "198.51.100.7", nobody)).toBe(UNKNOWN_ADDRESS);
  });

  it("normalises forms of one address so they share a budget", () => {
    expect(normaliseAddress("::FFFF:192.0.2.1")).toBe("192.0.2.1");
    expect(normaliseAddress(" 192.0.2.1:443 ")).toBe("192.0.2.1");
    expect(normaliseAddress("[2001:db8::1]:443")).toBe("2001:db8::1");
    expect(normaliseAddress("2001:DB8::1")).toBe("2001:db8::1");
    for (const bad of ["", "unknown", "1.2.3", "999.1.1.1", "<script>", "1.2.3.4, 5.6.7.8"]) expect([bad, normaliseAddress(bad)]).toEqual([bad, null]);
  });

  it("refuses a TRUSTED_PROXIES entry that is not an address or range", () => {
    for (const bad of ["proxy.local", "10.0.0.0/33", "10.0.0.0/", "::1/129", "10.0.0.1/8/1"]) expect(() => trustedProxyMatcher([bad])).toThrow(/not an IP address/);
  });
});
