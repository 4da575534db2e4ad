import { guardedRoute } from "@/lib/auth/guard";
import { toCsv } from "@/lib/csv";
import { getTrial, listOwnAssignments } from "@/lib/data/trials";
import { AppError } from "@/lib/errors";

/** The farm's own randomised list as CSV: one row per block code. */
export const GET = guardedRoute<{ trialId: string }>("trial-list:download", async (_request, { member, params }) => {
  const trial = await getTrial(member, params.trialId);
  const list = await listOwnAssignments(member, params.trialId);
  if (!list.length) throw new AppError("not_found", "Your farm has no list for this trial. Accept the invitation on the trial page first.");
  const csv = toCsv(
    list.map((entry) => ({ ...entry, trial: trial.code, treatmentName: entry.treatmentName ?? "" })),
    [
      { key: "trial", header: "trial" },
      { key: "sequence", header: "sequence" },
      { key: "permutedBlock", header: "permuted_block" },
      { key: "blockCode", header: "block_code" },
      { key: "armLabel", header: "arm" },
      { key: "strainCode", header: "strain" },
      { key: "treatmentName", header: "treatment" },
    ],
  );
  return new Response(csv, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="${trial.code}-block-list.csv"`,
      "cache-control": "no-store",
    },
  });
});
