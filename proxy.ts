import { NextResponse, type NextRequest } from "next/server";
import { isPublicPath, readSession } from "@/auth.config";
import { crossOriginRefusal } from "@/lib/http/origin";
import { pageContentSecurityPolicy, resourceContentSecurityPolicy, strictTransportSecurity } from "@/lib/http/security-headers";
import { appUrl } from "@/lib/app-url";

/**
 * Runs before every page and server action (not API routes, not static files):
 * - refuses a request that could change something unless it comes from the app's own origin
 *   (403, before any action runs; Next.js itself would answer a forged server action with a
 *   500). Route handlers make the same check in their guard (lib/auth/guard.ts): the proxy must
 *   not see their bodies, which Next.js would cut at 10 MB for it, and uploads are larger;
 * - gives every page a Content Security Policy with a fresh nonce, which Next.js reads from the
 *   request and puts on its own scripts and styles (API answers and static files get a policy
 *   that runs nothing from next.config.ts);
 * - sends the signed-out visitor of a page to sign in. Pages and actions check roles and whether
 *   the session may still be used themselves (lib/auth/guard.ts).
 */
export async function proxy(request: NextRequest): Promise<NextResponse> {
  const response = await answer(request);
  if (appUrl().startsWith("https://")) response.headers.set("Strict-Transport-Security", strictTransportSecurity);
  return response;
}

async function answer(request: NextRequest): Promise<NextResponse> {
  const refusal = crossOriginRefusal({ method: request.method, headers: request.headers, appUrl: appUrl() });
  if (refusal) {
    const refused = NextResponse.json({ error: "forbidden", message: refusal }, { status: 403 });
    refused.headers.set("Content-Security-Policy", resourceContentSecurityPolicy);
    return refused;
  }

  const { pathname, search } = request.nextUrl;
  const policy = pageContentSecurityPolicy(Buffer.from(crypto.randomUUID()).toString("base64"), appUrl());
  if (!isPublicPath(pathname) && !(await readSession(request.headers.get("cookie")))) {
    const signIn = new URL("/sign-in", request.url);
    signIn.searchParams.set("callbackUrl", `${pathname}${search}`);
    const redirect = NextResponse.redirect(signIn);
    redirect.headers.set("Content-Security-Policy", policy);
    return redirect;
  }
  const requestHeaders = new Headers(request.headers);
  requestHeaders.set("Content-Security-Policy", policy);
  const response = NextResponse.next({ request: { headers: requestHeaders } });
  response.headers.set("Content-Security-Policy", policy);
  return response;
}

export const config = {
  // API routes and static files get their headers from next.config.ts.
  // The manifest, the service worker and the icons load without a session (a browser fetches the manifest without cookies).
  matcher: ["/((?!api/|_next/static|_next/image|icon.svg|apple-icon.png|icons/|manifest.webmanifest|sw.js|robots.txt).*)"],
};
