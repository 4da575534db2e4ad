import { count } from "@/lib/words";
/**
 * How fast wrong passwords may be tried. Locking an account after a few failures lets anyone
 * who knows a member's e-mail lock them out; instead each (account, network address) pair, and
 * each network address across accounts, gets a few free tries and then a wait that doubles with
 * every further failure, up to a ceiling. The owner signing in from their own network is not
 * held up by guesses from elsewhere, and a guesser gets a handful of tries an hour.
 */

export interface PaceRule {
  /** Failures allowed before any wait. */
  free: number;
  /** The first wait, in seconds; it doubles with each further failure. */
  firstWaitSeconds: number;
  ceilingSeconds: number;
  /** Failures older than this are forgotten. */
  windowSeconds: number;
}

export const signInPace = {
  /** One account from one network address. */
  accountAndAddress: { free: 4, firstWaitSeconds: 2, ceilingSeconds: 15 * 60, windowSeconds: 24 * 60 * 60 },
  /** One network address across every account (trying many e-mails from one place). */
  address: { free: 30, firstWaitSeconds: 2, ceilingSeconds: 15 * 60, windowSeconds: 60 * 60 },
} as const satisfies Record<string, PaceRule>;

/** Seconds to wait after `failures` failures, the last one `sinceLastFailure` seconds ago (0: may try now). */
export function waitBeforeNextTry(rule: PaceRule, failures: number, sinceLastFailureSeconds: number): number {
  if (failures < rule.free) return 0;
  const wait = Math.min(rule.ceilingSeconds, rule.firstWaitSeconds * 2 ** (failures - rule.free));
  return Math.max(0, Math.ceil(wait - sinceLastFailureSeconds));
}

/** "12 seconds", "3 minutes": how long a person is asked to wait. */
export function waitInWords(seconds: number): string {
  if (seconds < 60) return `${count(seconds, "second")}`;
  const minutes = Math.ceil(seconds / 60);
  return `${count(minutes, "minute")}`;
}
