import { guardedRoute } from "@/lib/auth/guard";
import { getSeasonLogExport } from "@/lib/data/season-logs";
import { attachment } from "@/lib/season-logs/request";

/** GET /api/season-logs/export: the farm's blocks and harvests in the upload format (farm people only). */
export const GET = guardedRoute("farm-data:read", async (_request, { member }) => {
  const { fileName, csv } = await getSeasonLogExport(member);
  return new Response(csv, {
    headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": attachment(fileName), "cache-control": "no-store" },
  });
});
