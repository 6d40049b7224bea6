/** @type {import('next').NextConfig} */
const nextConfig = {
  // The libSQL client ships a native binding, and the mail packages load parts of themselves
  // dynamically: keep them out of the server bundle.
  serverExternalPackages: ["@libsql/client", "libsql", "nodemailer", "smtp-server", "mailparser"],
  poweredByHeader: false,
  typedRoutes: false,
  // forbidden() answers 403 with app/forbidden.tsx for a role that may not open a page.
  experimental: { authInterrupts: true },
};

export default nextConfig;
