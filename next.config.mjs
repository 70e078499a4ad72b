/** @type {import('next').NextConfig} */
const nextConfig = {
  // Separate build folders let several builds (CI, e2e, local) coexist in one checkout.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  serverExternalPackages: ["better-sqlite3"],
  // The build type-checks what it ships; tests are type-checked by `npm run typecheck`.
  typescript: { tsconfigPath: "tsconfig.build.json" },
};

export default nextConfig;
