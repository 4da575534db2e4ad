import { z } from "zod";
import { guardedRoute } from "@/lib/auth/guard";
import { getPooledResultsJson } from "@/lib/data/pooled-results";
import { AppError } from "@/lib/errors";
import { flushWindows } from "@/lib/pooled";

const optionalId = (what: string) =>
  z.preprocess(
    (value) => (value === "" || value === null ? undefined : value),
    z.uuid(`The ${what} in the address is not one of ours; choose it from the list.`).optional(),
  );

const pooledResultsQuerySchema = z.object({
  species: optionalId("species"),
  recipe: optionalId("substrate recipe"),
  method: optionalId("fruiting method"),
  window: z.preprocess((value) => value ?? "all", z.enum(flushWindows, "The flush window must be all, 1-2 or 1.")),
});

/** GET /api/results?species=&recipe=&method=&window=: the co-op's pooled strain comparison. */
export const GET = guardedRoute("pooled-results:read", async (request, { member }) => {
  const params = new URL(request.url).searchParams;
  const parsed = pooledResultsQuerySchema.safeParse(Object.fromEntries(params));
  if (!parsed.success) {
    throw new AppError(
      "invalid_input",
      "The results could not be read from that address. Choose the species and filters again.",
      parsed.error.issues.map((issue) => ({ field: issue.path.join("."), message: issue.message })),
    );
  }
  const { species, recipe, method, window } = parsed.data;
  const body = await getPooledResultsJson(member, {
    speciesId: species,
    substrateRecipeId: recipe,
    fruitingMethodId: method,
    flushWindow: window,
  });
  return new Response(body, { headers: { "content-type": "application/json", "cache-control": "private, no-store" } });
});
