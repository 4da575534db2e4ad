/** Fetches one of our JSON routes; a failure becomes an Error carrying the route's own message. */
export async function fetchJson<T>(url: string): Promise<T> {
  const response = await fetch(url, { headers: { accept: "application/json" } });
  const body = await response.json().catch(() => null);
  if (!response.ok) {
    const message =
      body && typeof body.message === "string" ? body.message : `The server answered ${response.status}. Try again in a moment.`;
    throw new Error(message);
  }
  return body as T;
}
