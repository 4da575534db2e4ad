import { guardedRoute } from "@/lib/auth/guard";
import { getTrialListSeasonLog } from "@/lib/data/trials";
import { attachment } from "@/lib/season-logs/request";

/** The farm's own randomised list as a season log to fill in and upload: one row per block code, in the list's order. */
export const GET = guardedRoute<{ trialId: string }>("trial-list:download", async (_request, { member, params }) => {
  const { fileName, csv } = await getTrialListSeasonLog(member, params.trialId);
  return new Response(csv, {
    headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": attachment(fileName), "cache-control": "no-store" },
  });
});
