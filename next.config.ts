import type { NextConfig } from "next";

const nextConfig: NextConfig = {
  // Several builds (the app, the test run) may share one checkout.
  distDir: process.env.NEXT_DIST_DIR ?? ".next",
  poweredByHeader: false,
  serverExternalPackages: ["pg", "bcryptjs"],
  experimental: { serverActions: { bodySizeLimit: "2mb" } },
};

export default nextConfig;
