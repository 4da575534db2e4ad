import { guardedRoute } from "@/lib/auth/guard";
import { getTrial, listOwnAssignments } from "@/lib/data/trials";
import { AppError } from "@/lib/errors";
import { trialListCsv } from "@/lib/season-logs/export";
import { attachment } from "@/lib/season-logs/request";

/** The farm's own randomised list as a season log to fill in and upload: one row per block code, in the list's order. */
export const GET = guardedRoute<{ trialId: string }>("trial-list:download", async (_request, { member, params }) => {
  const trial = await getTrial(member, params.trialId);
  const list = await listOwnAssignments(member, params.trialId);
  if (!list.length) throw new AppError("not_found", "Your farm has no list for this trial. Accept the invitation on the trial page first.");
  const csv = trialListCsv(
    list.map((entry) => ({
      blockCode: entry.blockCode,
      trialCode: trial.code,
      armLabel: entry.armLabel,
      strainCode: entry.strainCode,
      // The season log has a column for the fruiting method only; a humidity regime is the room's, not the block's.
      fruitingMethodCode: entry.treatmentKind === "fruiting_method" ? entry.treatmentCode : null,
    })),
  );
  return new Response(csv, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": attachment(`${trial.code}-block-list.csv`),
      "cache-control": "no-store",
    },
  });
});
