import { createHmac, timingSafeEqual } from "node:crypto";

/**
 * The unsubscribe-from-reminders link names one enrolment and carries a signature, so a link
 * works without signing in but cannot be made up for another farm.
 */
export function signOptOutToken(enrolmentId: string, secret: string): string {
  return `${enrolmentId}.${signature(enrolmentId, secret)}`;
}

export function verifyOptOutToken(token: string, secret: string): string | null {
  const [enrolmentId, given] = token.split(".");
  if (!enrolmentId || !given || !/^[0-9a-f-]{36}$/i.test(enrolmentId)) return null;
  const expected = Buffer.from(signature(enrolmentId, secret));
  const received = Buffer.from(given);
  return expected.length === received.length && timingSafeEqual(expected, received) ? enrolmentId : null;
}

function signature(enrolmentId: string, secret: string): string {
  return createHmac("sha256", secret).update(`trial-reminders-opt-out:${enrolmentId}`).digest("base64url");
}
