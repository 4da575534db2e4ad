import { getToken } from "next-auth/jwt";
import { NextResponse, type NextRequest } from "next/server";
import { isPublicPath } from "@/auth.config";

/**
 * Only sends the signed-out to the sign-in page; every page, route and action checks roles
 * itself. It reads the session cookie without re-issuing it, so a session ends a fixed time
 * after sign-in and a sign-out cannot be undone by a request still in flight.
 */
export async function proxy(request: NextRequest): Promise<NextResponse> {
  const { pathname, search } = request.nextUrl;
  if (isPublicPath(pathname)) return NextResponse.next();
  const token = await getToken({ req: request, secret: process.env.AUTH_SECRET, secureCookie: request.nextUrl.protocol === "https:" });
  if (token) return NextResponse.next();
  if (pathname.startsWith("/api/")) {
    return NextResponse.json({ error: "unauthenticated", message: "Your session has ended. Sign in again." }, { status: 401 });
  }
  const signIn = new URL("/sign-in", request.url);
  signIn.searchParams.set("callbackUrl", `${pathname}${search}`);
  return NextResponse.redirect(signIn);
}

export const config = {
  matcher: ["/((?!api/auth|_next/static|_next/image|icon.svg).*)"],
};
