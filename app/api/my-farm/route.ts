import { NextResponse } from "next/server";
import { guardedRoute } from "@/lib/auth/guard";
import { getMyFarm } from "@/lib/data/my-farm";
import { seasonFromSearchParam } from "@/lib/seasons";

/** GET /api/my-farm?season=2026: the member's own farm in a season (else the last 365 days), beside the co-op (farm people only). */
export const GET = guardedRoute("farm-data:read", async (request, { member }) => {
  const season = seasonFromSearchParam(new URL(request.url).searchParams.get("season") ?? undefined);
  return NextResponse.json(await getMyFarm(member, { season }), { headers: { "cache-control": "private, no-store" } });
});
