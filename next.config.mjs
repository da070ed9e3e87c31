// Next.js configuration. The database drivers and the worker-thread runner stay outside
// the server bundle: they load WebAssembly and native modules at run time.
/** @type {import('next').NextConfig} */
const nextConfig = {
  serverExternalPackages: [
    "@electric-sql/pglite",
    "pglite-prisma-adapter",
    "@prisma/adapter-pg",
    "pg",
    "pg-boss",
    "bcryptjs",
    "playwright-core",
  ],
  poweredByHeader: false,
  // The browser tests build into a folder of their own per port, so that a test run never
  // replaces the build under a running server.
  distDir: process.env.BEAMGATE_DIST_DIR ?? ".next",
  // `npm test` type-checks the whole project with tsc; the build need not do it twice.
  typescript: { ignoreBuildErrors: true },
  typedRoutes: false,
};

export default nextConfig;
