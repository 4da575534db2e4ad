import { NextResponse } from "next/server";
import { guardedRoute } from "@/lib/auth/guard";
import { getMyFarm } from "@/lib/data/my-farm";

/** GET /api/my-farm: the member's own farm this season, beside the co-op (farm people only). */
export const GET = guardedRoute("farm-data:read", async (_request, { member }) => {
  return NextResponse.json(await getMyFarm(member), { headers: { "cache-control": "private, no-store" } });
});
