import { expect } from "vitest";

/** Records every violation the page reports, from before its first script runs. */
export const recordViolations = () => {
  const seen: string[] = [];
  (window as unknown as { cspViolations: string[] }).cspViolations = seen;
  document.addEventListener("securitypolicyviolation", (event) => {
    seen.push(
      `${event.violatedDirective} blocked ${event.blockedURI || `inline "${event.sample}"`} at ${event.sourceFile}:${event.lineNumber}`,
    );
  });
};

export function expectSecurityHeaders(response: { headers(): Record<string, string> }, what: string, page = true) {
  const headers = response.headers();
  const policy = headers["content-security-policy"] ?? "";
  expect(policy, what).toContain("frame-ancestors 'none'");
  if (page) {
    expect(policy, what).toMatch(/script-src 'self' 'nonce-[A-Za-z0-9+/=]+' 'strict-dynamic'/);
    expect(policy, what).toContain("object-src 'none'");
    expect(policy, what).not.toContain("unsafe-inline");
    expect(policy, what).not.toContain("unsafe-eval");
  } else {
    expect(policy, what).toContain("default-src 'none'");
  }
  expect(headers["x-content-type-options"], what).toBe("nosniff");
  expect(headers["referrer-policy"], what).toBe("strict-origin-when-cross-origin");
  expect(headers["permissions-policy"], what).toContain("camera=()");
  expect(headers["permissions-policy"], what).toContain("geolocation=()");
  expect(headers["x-frame-options"], what).toBe("DENY");
}
