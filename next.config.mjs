/** @type {import('next').NextConfig} */
const nextConfig = {
  poweredByHeader: false,
  // piscina starts its threads from its own files in node_modules.
  serverExternalPackages: ["better-sqlite3", "pino", "pino-pretty", "exceljs", "piscina"],
  devIndicators: false,
  // forbidden() renders app/forbidden.tsx with a 403 for pages a role may not open.
  experimental: { authInterrupts: true },
};

export default nextConfig;
