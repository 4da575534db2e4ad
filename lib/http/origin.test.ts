import { describe, expect, it } from "vitest";
import { crossOriginRefusal } from "./origin";

const appUrl = "http://127.0.0.1:3000";
const check = (method: string, headers: Record<string, string>) => crossOriginRefusal({ method, headers: new Headers(headers), appUrl });

describe("a request that could change something", () => {
  it("goes on from the app's own origin, by its configured address or by the host the browser asked for", () => {
    expect(check("POST", { origin: "http://127.0.0.1:3000", host: "127.0.0.1:3000" })).toBeNull();
    expect(check("POST", { origin: "http://localhost:3000", host: "localhost:3000" })).toBeNull();
    expect(check("DELETE", { origin: "http://127.0.0.1:3000" })).toBeNull();
  });

  it("is refused from another site, from an opaque origin, or from our host on another port", () => {
    expect(check("POST", { origin: "https://attacker.example", host: "127.0.0.1:3000" })).toMatch(
      /another site \(https:\/\/attacker\.example\)/,
    );
    expect(check("POST", { origin: "null", host: "127.0.0.1:3000" })).toMatch(/another site/);
    expect(check("POST", { origin: "http://127.0.0.1:4000", host: "127.0.0.1:3000" })).toMatch(/another site/);
    expect(check("PUT", { origin: "http://127.0.0.1.attacker.example", host: "127.0.0.1:3000" })).toMatch(/another site/);
  });

  it("naming no origin goes on only when the browser says it is same-origin or the Referer is ours", () => {
    expect(check("POST", { host: "127.0.0.1:3000", "sec-fetch-site": "same-origin" })).toBeNull();
    expect(check("POST", { host: "127.0.0.1:3000", referer: "http://127.0.0.1:3000/season-logs" })).toBeNull();
    expect(check("POST", { host: "127.0.0.1:3000", "sec-fetch-site": "cross-site" })).toMatch(/did not say which site/);
    expect(check("POST", { host: "127.0.0.1:3000", referer: "https://attacker.example/page" })).toMatch(/did not say which site/);
    expect(check("POST", { host: "127.0.0.1:3000" })).toMatch(/did not say which site/);
  });

  it("leaves reading alone: GET, HEAD and OPTIONS change nothing", () => {
    for (const method of ["GET", "HEAD", "OPTIONS"]) expect(check(method, { origin: "https://attacker.example" })).toBeNull();
  });
});
