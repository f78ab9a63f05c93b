// Whose word the server takes for a client's address: the socket's, unless the peer is a configured
// proxy (TAPWRIGHT_TRUSTED_PROXIES); then the nearest hop in X-Forwarded-For that is not a proxy.
import { describe, expect, it } from "vitest";
import { clientAddress, parseProxies } from "../../scripts/lib/proxies.mjs";

describe("clientAddress", () => {
  const none = parseProxies("");
  const proxies = parseProxies("10.0.0.1, 10.1.0.0/16, fd00::/8");

  it("with no trusted proxies, the socket's address whatever the header says", () => {
    expect(clientAddress("127.0.0.1", "203.0.113.9", none)).toBe("127.0.0.1");
    expect(clientAddress("::ffff:127.0.0.1", "1.2.3.4, 5.6.7.8", none)).toBe("127.0.0.1");
    expect(clientAddress("198.51.100.7", undefined, none)).toBe("198.51.100.7");
  });

  it("from an untrusted peer, the header is ignored even when proxies are configured", () => {
    expect(clientAddress("198.51.100.7", "10.0.0.1", proxies)).toBe("198.51.100.7");
  });

  it("from a trusted proxy, the right-most hop that is not a proxy (a client cannot prepend its own)", () => {
    expect(clientAddress("10.0.0.1", "203.0.113.9", proxies)).toBe("203.0.113.9");
    expect(clientAddress("10.0.0.1", "6.6.6.6, 203.0.113.9, 10.1.4.2", proxies)).toBe("203.0.113.9");
    expect(clientAddress("::ffff:10.0.0.1", "2001:db8::1", proxies)).toBe("2001:db8::1");
    expect(clientAddress("fd12::3", "198.51.100.1", proxies)).toBe("198.51.100.1");
  });

  it("from a trusted proxy without a usable header, the proxy itself", () => {
    expect(clientAddress("10.0.0.1", undefined, proxies)).toBe("10.0.0.1");
    expect(clientAddress("10.0.0.1", "not-an-address", proxies)).toBe("10.0.0.1");
  });

  it("a malformed list is refused with the entry at fault", () => {
    expect(() => parseProxies("10.0.0.1, proxy.example")).toThrow(/"proxy.example"/);
    expect(() => parseProxies("10.0.0.0/33")).toThrow(/prefix/);
  });
});
