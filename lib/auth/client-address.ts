/**
 * The network address a request came from, as far as it can be trusted. A client can send any
 * X-Forwarded-For it likes; only a reverse proxy we run appends to it truthfully. So the address
 * is read from the right: the connection's own peer, then one entry further left for each
 * trusted proxy in front of the app (RHIZO_TRUSTED_PROXIES, default 0: the peer itself).
 */

/** Set by instrumentation.ts from the connection itself, over anything a client sent. */
export const peerAddressHeader = "x-rhizomorph-peer-address";

/** When the peer is not known (the very first request before the server was ready): one shared bucket. */
export const unknownAddress = "unknown";

function normalise(address: string): string {
  const trimmed = address.trim();
  // IPv4 seen through an IPv6 socket.
  return trimmed.startsWith("::ffff:") && trimmed.includes(".") ? trimmed.slice("::ffff:".length) : trimmed;
}

/** `headers` as the app receives them; `trustedProxies` as configured. */
export function clientAddress(headers: Headers, trustedProxies: number): string {
  const peer = headers.get(peerAddressHeader);
  if (!peer) return unknownAddress;
  if (trustedProxies === 0) return normalise(peer);
  const forwarded = (headers.get("x-forwarded-for") ?? "")
    .split(",")
    .map(normalise)
    .filter((entry) => entry !== "");
  const chain = [...forwarded, normalise(peer)];
  // Each trusted proxy appended the address it saw; the one left of them all is the client.
  return chain[chain.length - 1 - trustedProxies] ?? chain[0];
}
