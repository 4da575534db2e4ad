/**
 * Keeps only the path and query of a return address, so a sign-in can never send someone
 * to another site, and host-name differences (127.0.0.1 vs localhost) do not matter.
 */
export function safeReturnPath(value: string | null | undefined): string {
  if (!value) return "/";
  try {
    const url = new URL(value, "http://placeholder.invalid");
    const path = `${url.pathname}${url.search}`;
    if (!path.startsWith("/") || path.startsWith("//") || path.startsWith("/sign-in")) return "/";
    return path;
  } catch {
    return "/";
  }
}
