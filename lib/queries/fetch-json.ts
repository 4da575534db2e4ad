import { z } from "zod";

/** What our routes answer when they refuse (lib/http). */
export const routeMessage = z.object({ message: z.string() });

/** Fetches one of our JSON routes; a failure becomes an Error carrying the route's own message. */
export async function fetchJson<T>(url: string): Promise<T> {
  const response = await fetch(url, { headers: { accept: "application/json" } });
  const body: unknown = await response.json().catch(() => null);
  if (!response.ok) {
    const explained = routeMessage.safeParse(body);
    throw new Error(explained.success ? explained.data.message : `The server answered ${response.status}. Try again in a moment.`);
  }
  return body as T;
}
