/** @type {import('next').NextConfig} */
const nextConfig = {
  poweredByHeader: false,
  serverExternalPackages: ["better-sqlite3", "pino", "pino-pretty", "exceljs"],
  devIndicators: false,
  // forbidden() renders app/forbidden.tsx with a 403 for pages a role may not open.
  experimental: { authInterrupts: true },
};

export default nextConfig;
