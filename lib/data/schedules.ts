import "server-only";
import { cooperativeSettings } from "@/db/schema";
import type { CooperativeSettings } from "@/lib/jobs/definitions";
import { asNobody } from "./context";

/**
 * The co-op's settings row as the job workers read it to set their schedules (lib/jobs/worker.ts,
 * syncSchedules): the app's role with no member (every context may read the settings), so a
 * schedule can follow any column without widening the analyst's reach.
 */
export async function settingsForSchedules(): Promise<CooperativeSettings | null> {
  const [row] = await asNobody((tx) => tx.select().from(cooperativeSettings));
  return row ?? null;
}
