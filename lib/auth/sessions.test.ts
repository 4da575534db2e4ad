import { describe, expect, it } from "vitest";
import { sessionClaimsOf, sessionIsCurrent, sessionMaxAgeSeconds, type SessionClaims } from "./sessions";

const signedInAt = Date.UTC(2026, 11, 2, 8, 0, 0);
const claims: SessionClaims = { memberId: "m-1", sessionId: "s-1", sessionVersion: 3, signedInAt };
const state = { sessionVersion: 3, endedSessionIds: new Set<string>() };

describe("a session", () => {
  it("is current when issued under the member's version, not signed out and younger than a working day", () => {
    expect(sessionIsCurrent(state, claims, signedInAt + 1000)).toBe(true);
  });

  it("ends when the member's version moves on (sign out everywhere, password, role, deactivation)", () => {
    expect(sessionIsCurrent({ ...state, sessionVersion: 4 }, claims, signedInAt + 1000)).toBe(false);
  });

  it("ends when it signed out, and no other session of the member with it", () => {
    const ended = { ...state, endedSessionIds: new Set(["s-1"]) };
    expect(sessionIsCurrent(ended, claims, signedInAt + 1000)).toBe(false);
    expect(sessionIsCurrent(ended, { ...claims, sessionId: "s-2" }, signedInAt + 1000)).toBe(true);
  });

  it(`ends ${sessionMaxAgeSeconds / 3600} hours after sign-in, and a sign-in time in the future is refused`, () => {
    expect(sessionIsCurrent(state, claims, signedInAt + sessionMaxAgeSeconds * 1000 - 1)).toBe(true);
    expect(sessionIsCurrent(state, claims, signedInAt + sessionMaxAgeSeconds * 1000)).toBe(false);
    expect(sessionIsCurrent(state, { ...claims, signedInAt: signedInAt + 3_600_000 }, signedInAt)).toBe(false);
  });

  it("reads the claims of a token, and nothing from a token that lacks any (a cookie from before sessions could end)", () => {
    expect(sessionClaimsOf({ memberId: "m-1", sid: "s-1", sv: 3, signedInAt, exp: 1 })).toEqual(claims);
    expect(sessionClaimsOf({ memberId: "m-1", exp: 1 })).toBeNull();
    expect(sessionClaimsOf({ memberId: "m-1", sid: "s-1", sv: "3", signedInAt })).toBeNull();
    expect(sessionClaimsOf(null)).toBeNull();
  });
});
