/**
 * Cross-site request forgery: a page on another site can make a member's browser send a POST
 * to Rhizomorph with the member's cookie. Browsers name the page's origin in the Origin header
 * of every POST (and say in Sec-Fetch-Site where it came from), so any request that could
 * change something must come from the app's own origin, or it is refused before a route
 * handler or server action runs.
 */

const safeMethods = new Set(["GET", "HEAD", "OPTIONS"]);

export interface OriginCheck {
  method: string;
  headers: Headers;
  /** The app's configured address (APP_URL), e.g. http://127.0.0.1:3000. */
  appUrl: string;
}

function originOf(value: string): string | null {
  try {
    const url = new URL(value);
    return url.protocol === "http:" || url.protocol === "https:" ? url.origin : null;
  } catch {
    return null;
  }
}

/** The origins the app answers on: its configured address and the host the browser asked for. */
function ownOrigins({ headers, appUrl }: OriginCheck): Set<string> {
  const own = new Set<string>();
  const configured = originOf(appUrl);
  if (configured) own.add(configured);
  const host = headers.get("host");
  if (host) {
    // The browser names the host it asked for; a page elsewhere cannot make it say ours.
    for (const scheme of ["http", "https"]) {
      const origin = originOf(`${scheme}://${host}`);
      if (origin) own.add(origin);
    }
  }
  return own;
}

/** Null when the request may go on; otherwise the message to refuse it with (403). */
export function crossOriginRefusal(check: OriginCheck): string | null {
  if (safeMethods.has(check.method.toUpperCase())) return null;
  const own = ownOrigins(check);
  const origin = check.headers.get("origin");
  if (origin !== null) {
    if (origin !== "null" && own.has(originOf(origin) ?? "")) return null;
    return `This request came from another site (${origin.slice(0, 100)}), so Rhizomorph refused it. Open Rhizomorph at ${check.appUrl} and try again from there.`;
  }
  // No Origin at all: only a same-origin fetch, by the browser's own account, or a Referer of ours.
  if (check.headers.get("sec-fetch-site") === "same-origin") return null;
  const referer = check.headers.get("referer");
  if (referer && own.has(originOf(referer) ?? "")) return null;
  return `This request did not say which site sent it, so Rhizomorph refused it. Open Rhizomorph at ${check.appUrl} in a browser and try again from there.`;
}
