import { guardedRoute } from "@/lib/auth/guard";
import { getPooledResultsJson, toResultsQuery } from "@/lib/data/pooled-results";
import { AppError } from "@/lib/errors";
import { readResultsAddress } from "@/lib/pooled/results-address";

/** GET /api/results?species=&recipe=&method=&window=&season=: the co-op's pooled strain comparison. */
export const GET = guardedRoute("pooled-results:read", async (request, { member }) => {
  const reading = readResultsAddress(Object.fromEntries(new URL(request.url).searchParams));
  if (!reading.ok) {
    throw new AppError(
      "invalid_input",
      "The results could not be read from that address. Choose the species and filters again.",
      reading.problems,
    );
  }
  const body = await getPooledResultsJson(member, toResultsQuery(reading.selection));
  return new Response(body, { headers: { "content-type": "application/json", "cache-control": "private, no-store" } });
});
