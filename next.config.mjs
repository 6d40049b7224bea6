/** @type {import('next').NextConfig} */
const nextConfig = {
  // The libSQL client ships a native binding; keep it out of the server bundle.
  serverExternalPackages: ["@libsql/client", "libsql"],
  poweredByHeader: false,
  typedRoutes: false,
  // forbidden() answers 403 with app/forbidden.tsx for a role that may not open a page.
  experimental: { authInterrupts: true },
};

export default nextConfig;
