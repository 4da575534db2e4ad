import "server-only";
import { cookies } from "next/headers";
import type { Member } from "@/lib/data/members";
import { browserZoneCookie } from "./browser-zone";
import { canonicalTimeZone, type TimeDisplay } from "./display";

/** How this member reads times on the page being rendered: their chosen zone, else their browser's, else UTC. */
export async function timeDisplayFor(member: Pick<Member, "timeZone" | "dateStyle">): Promise<TimeDisplay> {
  if (member.timeZone) return { timeZone: member.timeZone, dateStyle: member.dateStyle };
  const sent = (await cookies()).get(browserZoneCookie)?.value;
  let browserZone: string | null = null;
  try {
    browserZone = sent ? canonicalTimeZone(decodeURIComponent(sent)) : null;
  } catch {
    // A cookie that is not URI-encoded was not set by us: ignore it.
  }
  return { timeZone: browserZone ?? "UTC", dateStyle: member.dateStyle };
}
