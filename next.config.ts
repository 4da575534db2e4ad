import type { NextConfig } from "next";
import { commonSecurityHeaders, resourceContentSecurityPolicy, serviceWorkerContentSecurityPolicy } from "./lib/http/security-headers";

const nextConfig: NextConfig = {
  // Every response; pages get their Content Security Policy from proxy.ts, which does not run
  // for API routes and static files, so those get theirs here.
  headers() {
    const staticPolicy = [{ key: "Content-Security-Policy", value: resourceContentSecurityPolicy }];
    return Promise.resolve([
      { source: "/:path*", headers: commonSecurityHeaders() },
      ...[
        "/api/:path*",
        "/_next/static/:path*",
        "/_next/image/:path*",
        "/icon.svg",
        "/apple-icon.png",
        "/icons/:path*",
        "/manifest.webmanifest",
        "/robots.txt",
      ].map((source) => ({ source, headers: staticPolicy })),
      // The service worker's own policy governs what it may fetch: the app itself, nothing else.
      { source: "/sw.js", headers: [{ key: "Content-Security-Policy", value: serviceWorkerContentSecurityPolicy }] },
    ]);
  },
  // Several builds (the app, the test run) may share one checkout.
  distDir: process.env.NEXT_DIST_DIR ?? ".next",
  poweredByHeader: false,
  serverExternalPackages: ["pg", "bcryptjs"],
  experimental: { serverActions: { bodySizeLimit: "2mb" } },
};

export default nextConfig;
