import { NextResponse, type NextRequest } from "next/server";
import { isPublicPath, sessionMemberId } from "@/auth.config";

/**
 * Only sends the signed-out to the sign-in page; every page, route and action checks roles
 * itself. API routes are left out: their one guard answers the signed-out with 401 anyway.
 */
export async function proxy(request: NextRequest): Promise<NextResponse> {
  const { pathname, search } = request.nextUrl;
  if (isPublicPath(pathname)) return NextResponse.next();
  if (await sessionMemberId(request.headers)) return NextResponse.next();
  const signIn = new URL("/sign-in", request.url);
  signIn.searchParams.set("callbackUrl", `${pathname}${search}`);
  return NextResponse.redirect(signIn);
}

export const config = {
  matcher: ["/((?!api/|_next/static|_next/image|icon.svg).*)"],
};
