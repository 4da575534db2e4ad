import "server-only";
import { notFound } from "next/navigation";
import { getTrial } from "@/lib/data/trials";
import type { Member } from "@/lib/data/members";
import { isAppError } from "@/lib/errors";

/** A trial for a page, or Next's not-found page when there is none the member may see. */
export async function trialOrNotFound(member: Member, trialId: string, options: { run?: number } = {}) {
  try {
    return await getTrial(member, trialId, options);
  } catch (error) {
    if (isAppError(error) && error.code === "not_found") notFound();
    throw error;
  }
}
