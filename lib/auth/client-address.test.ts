import { describe, expect, it } from "vitest";
import { clientAddress, peerAddressHeader, unknownAddress } from "./client-address";

const request = (peer: string | null, forwarded?: string) => {
  const headers = new Headers();
  if (peer !== null) headers.set(peerAddressHeader, peer);
  if (forwarded !== undefined) headers.set("x-forwarded-for", forwarded);
  return headers;
};

describe("the client's network address", () => {
  it("is the connection's peer when no proxy is trusted, whatever X-Forwarded-For claims", () => {
    expect(clientAddress(request("198.51.100.4", "203.0.113.9"), 0)).toBe("198.51.100.4");
    expect(clientAddress(request("::ffff:127.0.0.1", "10.0.0.1, 10.0.0.2"), 0)).toBe("127.0.0.1");
  });

  it("is read from the right behind trusted proxies, so entries a client made up further left are ignored", () => {
    // The client sent "203.0.113.9"; the proxy appended the client's real address 198.51.100.4 and connected from 10.0.0.5.
    expect(clientAddress(request("10.0.0.5", "203.0.113.9, 198.51.100.4"), 1)).toBe("198.51.100.4");
    // Two proxies: the outer one appended the client, the inner one appended the outer one.
    expect(clientAddress(request("10.0.0.6", "203.0.113.9, 198.51.100.4, 10.0.0.5"), 2)).toBe("198.51.100.4");
    // Fewer entries than proxies configured: the leftmost known address, never a made-up one further left.
    expect(clientAddress(request("10.0.0.5"), 2)).toBe("10.0.0.5");
  });

  it("is one shared 'unknown' when the peer was not recorded, never a forwarded claim", () => {
    expect(clientAddress(request(null, "203.0.113.9"), 0)).toBe(unknownAddress);
    expect(clientAddress(request(null, "203.0.113.9"), 1)).toBe(unknownAddress);
  });
});
