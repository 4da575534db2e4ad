import { NextResponse } from "next/server";
import { guardedRoute } from "@/lib/auth/guard";
import { getMyFarm } from "@/lib/data/my-farm";
import { AppError } from "@/lib/errors";
import { seasonInAddressSchema } from "@/lib/seasons";

/** GET /api/my-farm?season=2026: the member's own farm in a season (else the last 365 days), beside the co-op (farm people only). */
export const GET = guardedRoute("farm-data:read", async (request, { member }) => {
  const reading = seasonInAddressSchema.safeParse(new URL(request.url).searchParams.get("season") ?? undefined);
  if (!reading.success) {
    throw new AppError(
      "invalid_input",
      "Your farm's figures could not be read from that address. Choose the season again.",
      reading.error.issues.map((issue) => ({ field: "season", message: issue.message })),
    );
  }
  return NextResponse.json(await getMyFarm(member, { season: reading.data ?? null }), {
    headers: { "cache-control": "private, no-store" },
  });
});
