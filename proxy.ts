// Only sends the signed-out to the sign-in page; every page, route and action checks roles itself.
export { auth as proxy } from "@/auth";

export const config = {
  matcher: ["/((?!api/auth|_next/static|_next/image|icon.svg|fonts/).*)"],
};
