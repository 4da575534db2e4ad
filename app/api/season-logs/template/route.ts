import { farmContextOf, guardedRoute } from "@/lib/auth/guard";
import { getTemplateCodes } from "@/lib/data/season-logs";
import { seasonLogTemplateCsv } from "@/lib/import";
import { attachment } from "@/lib/season-logs/request";

/** The shared schema's template, with example rows that use the co-op's own codes. */
export const GET = guardedRoute("registry:read", async (_request, { member }) => {
  const codes = await getTemplateCodes(farmContextOf(member));
  return new Response(seasonLogTemplateCsv(codes), {
    headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": attachment("season-log-template.csv") },
  });
});
