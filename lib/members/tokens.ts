import { createHash, randomBytes } from "node:crypto";

export type TokenPurpose = "invitation" | "password_reset";

/** How long a one-time link stays good: an invitation waits for a busy grower, a reset does not. */
export const tokenLifetimeMinutes: Record<TokenPurpose, number> = {
  invitation: 7 * 24 * 60,
  password_reset: 60,
};

/** Only this hash is stored; the token itself travels once, in the e-mail. */
export function hashToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

/** 32 random bytes, URL-safe: too many to guess, short enough for a link. */
export function newAccessToken(): { token: string; tokenHash: string } {
  const token = randomBytes(32).toString("base64url");
  return { token, tokenHash: hashToken(token) };
}

export function tokenExpiresAt(purpose: TokenPurpose, now: Date): Date {
  return new Date(now.getTime() + tokenLifetimeMinutes[purpose] * 60_000);
}

/** A token looks like ours (43 URL-safe characters) before we spend a database query on it. */
export function isWellFormedToken(token: unknown): token is string {
  return typeof token === "string" && /^[A-Za-z0-9_-]{43}$/.test(token);
}

export function accessLink(baseUrl: string, purpose: TokenPurpose, token: string): string {
  const path = purpose === "invitation" ? "/accept-invitation" : "/reset-password";
  return `${baseUrl.replace(/\/+$/, "")}${path}?token=${encodeURIComponent(token)}`;
}

/** What a person sees about a link that cannot be used, with what to do next. */
export function tokenRefusal(state: "used" | "expired" | "unknown" | "taken", purpose: TokenPurpose): string {
  const again = purpose === "invitation" ? "Ask whoever invited you to send a new invitation." : "Ask for a new reset link below.";
  switch (state) {
    case "used":
      return `This link has already been used; each link works once. ${purpose === "invitation" ? "If you set your password, sign in." : again}`;
    case "expired":
      return `This link has expired. ${again}`;
    case "taken":
      return "This e-mail address already belongs to an active member. Sign in, or reset your password from the sign-in page.";
    default:
      return `This link is not one we sent, or it was copied incompletely. Open it again from the e-mail; if that fails, ${again.charAt(0).toLowerCase()}${again.slice(1)}`;
  }
}
