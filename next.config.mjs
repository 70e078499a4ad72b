/** @type {import('next').NextConfig} */
const nextConfig = {
  // Separate build folders let several builds (CI, e2e, local) coexist in one checkout.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  serverExternalPackages: ["better-sqlite3"],
};

export default nextConfig;
