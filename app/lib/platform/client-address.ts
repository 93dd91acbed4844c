import { BlockList, isIP } from "node:net";

/**
 * Which hops may speak for the client. Without a trusted proxy the socket's peer is the client and
 * X-Forwarded-For is ignored (anyone can write it). The rules follow Express's `trust proxy`
 * setting (the proxy-addr package): a hop count trusts that many proxies in front of the app; a
 * list trusts any hop whose address is in it.
 */
export type TrustProxy =
  { kind: "none" } | { kind: "hops"; hops: number } | { kind: "list"; list: BlockList; text: string };

const NAMED_RANGES: Record<string, [string, number, "ipv4" | "ipv6"][]> = {
  loopback: [
    ["127.0.0.0", 8, "ipv4"],
    ["::1", 128, "ipv6"],
  ],
  linklocal: [
    ["169.254.0.0", 16, "ipv4"],
    ["fe80::", 10, "ipv6"],
  ],
  uniquelocal: [
    ["10.0.0.0", 8, "ipv4"],
    ["172.16.0.0", 12, "ipv4"],
    ["192.168.0.0", 16, "ipv4"],
    ["fc00::", 7, "ipv6"],
  ],
};

/** Parses TRUST_PROXY: empty or "false" (none), a whole number of hops, or a comma-separated list. */
export function parseTrustProxy(value: string | undefined): TrustProxy {
  const text = (value ?? "").trim();
  if (text === "" || text === "false" || text === "0") return { kind: "none" };
  if (/^\d+$/.test(text)) {
    const hops = Number(text);
    if (hops > 10) throw new Error(`TRUST_PROXY=${text}: at most 10 proxy hops.`);
    return { kind: "hops", hops };
  }
  if (text === "true") {
    throw new Error(
      "TRUST_PROXY=true would believe any X-Forwarded-For a client writes. Give the number of proxies in front of the app (e.g. 1) or their addresses (e.g. 10.0.0.5, 10.0.1.0/24, loopback).",
    );
  }
  const list = new BlockList();
  for (const raw of text.split(",")) {
    const entry = raw.trim();
    if (!entry) continue;
    const named = NAMED_RANGES[entry];
    if (named) {
      for (const [net, prefix, family] of named) list.addSubnet(net, prefix, family);
      continue;
    }
    const [address, prefixText] = entry.split("/");
    const family = isIP(address ?? "");
    if (!address || family === 0) {
      throw new Error(
        `TRUST_PROXY: "${entry}" is not an IP address, a subnet (10.0.0.0/8) or one of loopback, linklocal, uniquelocal.`,
      );
    }
    const type = family === 4 ? "ipv4" : "ipv6";
    if (prefixText === undefined) {
      list.addAddress(address, type);
    } else {
      const prefix = Number(prefixText);
      if (!/^\d+$/.test(prefixText) || prefix > (family === 4 ? 32 : 128)) {
        throw new Error(`TRUST_PROXY: "${entry}" has an invalid prefix length.`);
      }
      list.addSubnet(address, prefix, type);
    }
  }
  return { kind: "list", list, text };
}

/** "::ffff:192.0.2.1" (an IPv4 peer on a dual-stack socket) → "192.0.2.1". */
export function normalizeAddress(address: string): string {
  const trimmed = address.trim();
  const mapped = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/i.exec(trimmed);
  return mapped ? mapped[1]! : trimmed;
}

function isTrusted(address: string, trust: Extract<TrustProxy, { kind: "list" }>): boolean {
  const family = isIP(address);
  if (family === 0) return false;
  return trust.list.check(address, family === 4 ? "ipv4" : "ipv6");
}

/**
 * The client's address: the socket's peer, or, walking X-Forwarded-For from the right, the first
 * hop that is not a trusted proxy. Entries left of that are the client's to invent and are never
 * read. Null when the server did not pass the socket's address.
 */
export function resolveClientAddress(
  socketAddress: string | null | undefined,
  forwardedFor: string | null,
  trust: TrustProxy,
): string | null {
  if (!socketAddress) return null;
  const chain = [normalizeAddress(socketAddress)];
  if (trust.kind === "none" || !forwardedFor) return chain[0]!;
  const forwarded = forwardedFor
    .split(",")
    .map((s) => normalizeAddress(s))
    .filter(Boolean)
    .reverse();
  chain.push(...forwarded);
  if (trust.kind === "hops") return chain[Math.min(trust.hops, chain.length - 1)]!;
  for (let i = 0; i < chain.length - 1; i++) if (!isTrusted(chain[i]!, trust)) return chain[i]!;
  return chain[chain.length - 1]!;
}

/**
 * The rate-limit bucket for an address: IPv4 as it is, IPv6 by its /64 network (one subscriber
 * usually holds a whole /64, so single addresses would give a bot endless fresh buckets).
 */
export function addressBucket(address: string | null): string {
  if (!address) return "unknown";
  if (isIP(address) !== 6) return address.slice(0, 64);
  const [head = "", tail] = address.toLowerCase().split("::");
  const left = head ? head.split(":") : [];
  const right = tail === undefined ? [] : tail ? tail.split(":") : [];
  const groups = tail === undefined ? left : [...left, ...Array(8 - left.length - right.length).fill("0"), ...right];
  return `${groups
    .slice(0, 4)
    .map((g) => g.replace(/^0+(?=.)/, ""))
    .join(":")}::/64`;
}
