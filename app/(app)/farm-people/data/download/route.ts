import { guardedRoute } from "@/lib/auth/guard";
import { exportFarmData } from "@/lib/data/data-rights";

/** The farm's whole data download, as a zip. */
export const GET = guardedRoute("farm-data:export", async (_request, { member }) => {
  const { fileName, zip } = await exportFarmData(member);
  return new Response(Buffer.from(zip), {
    headers: {
      "content-type": "application/zip",
      "content-disposition": `attachment; filename="${fileName}"`,
      "cache-control": "no-store",
    },
  });
});
