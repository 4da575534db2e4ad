import { guardedRoute } from "@/lib/auth/guard";
import { getTemplateCodes } from "@/lib/data/season-logs";
import { seasonLogTemplateCsv, seasonLogTemplateXlsx } from "@/lib/import";
import { attachment } from "@/lib/season-logs/request";

/** The shared schema's template (CSV, or .xlsx with ?format=xlsx), with example rows that use the co-op's own codes. */
export const GET = guardedRoute("registry:read", async (request, { member }) => {
  const codes = await getTemplateCodes(member);
  if (new URL(request.url).searchParams.get("format") === "xlsx") {
    return new Response(new Uint8Array(await seasonLogTemplateXlsx(codes)), {
      headers: {
        "content-type": "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
        "content-disposition": attachment("season-log-template.xlsx"),
      },
    });
  }
  return new Response(seasonLogTemplateCsv(codes), {
    headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": attachment("season-log-template.csv") },
  });
});
