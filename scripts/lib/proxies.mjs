// Which peers may tell the server a client's address (X-Forwarded-For): TAPWRIGHT_TRUSTED_PROXIES,
// a comma-separated list of addresses and CIDR ranges (IPv4 or IPv6), e.g. "127.0.0.1, 10.0.0.0/8".
// Nobody is trusted by default, so a client cannot choose the address it is rate-limited under.
import { BlockList, isIP } from "node:net";

/** "::ffff:10.1.2.3" (an IPv4 peer on a dual-stack socket) → "10.1.2.3". */
export function plainAddress(address) {
  const a = String(address ?? "").trim();
  const mapped = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/i.exec(a);
  return mapped ? mapped[1] : a;
}

/** Parses the list; throws with the entry at fault, so a typo does not silently trust nobody (or everybody). */
export function parseProxies(list) {
  const trusted = new BlockList();
  for (const raw of String(list)
    .split(",")
    .map((s) => s.trim())
    .filter(Boolean)) {
    const [address, bits] = raw.split("/");
    const family = isIP(plainAddress(address));
    if (family === 0) throw new Error(`TAPWRIGHT_TRUSTED_PROXIES: "${raw}" is not an IP address or CIDR range.`);
    const type = family === 6 ? "ipv6" : "ipv4";
    if (bits === undefined) {
      trusted.addAddress(plainAddress(address), type);
      continue;
    }
    const prefix = Number(bits);
    if (!Number.isInteger(prefix) || prefix < 0 || prefix > (family === 6 ? 128 : 32)) {
      throw new Error(`TAPWRIGHT_TRUSTED_PROXIES: "${raw}" has a bad prefix length.`);
    }
    trusted.addSubnet(plainAddress(address), prefix, type);
  }
  return trusted;
}

export function isTrusted(address, trusted) {
  const a = plainAddress(address);
  const family = isIP(a);
  return family !== 0 && trusted.check(a, family === 6 ? "ipv6" : "ipv4");
}

/**
 * The client's address for a request from `peer` carrying `forwardedFor` (the X-Forwarded-For
 * value): the peer itself unless it is a trusted proxy; then, walking the list from its right end
 * (the hop nearest to us), the first address that is not a trusted proxy.
 */
export function clientAddress(peer, forwardedFor, trusted) {
  let client = plainAddress(peer);
  if (!isTrusted(client, trusted)) return client;
  const hops = String(forwardedFor ?? "")
    .split(",")
    .map((s) => plainAddress(s))
    .filter((s) => isIP(s) !== 0);
  for (let i = hops.length - 1; i >= 0; i--) {
    client = hops[i];
    if (!isTrusted(client, trusted)) break;
  }
  return client;
}
