import type { NextConfig } from "next";
import { staticSecurityHeaders } from "./lib/security/headers";

const nextConfig: NextConfig = {
  // Separate build folders let several builds (CI, e2e, local) coexist in one checkout.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  serverExternalPackages: ["better-sqlite3"],
  // The build type-checks what it ships; tests are type-checked by `npm run typecheck`.
  typescript: { tsconfigPath: "tsconfig.build.json" },
  // The fixed security headers on every response; the per-request content security policy is set in proxy.ts.
  poweredByHeader: false,
  async headers() {
    return [{ source: "/:path*", headers: staticSecurityHeaders(process.env.NODE_ENV === "production") }];
  },
};

export default nextConfig;
