import type { Metadata, Viewport } from "next";
import { GeistMono } from "geist/font/mono";
import { GeistSans } from "geist/font/sans";
import { connection } from "next/server";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Headroom", template: "%s · Headroom" },
  description: "The vapor-hazard register for volatile liquids in storage.",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1, themeColor: "#0b5d6b" };

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  // Every page is rendered per request: its scripts carry that response's CSP nonce (see proxy.ts).
  await connection();
  return (
    <html lang="en" className={`${GeistSans.variable} ${GeistMono.variable}`}>
      <body className="min-h-screen font-sans">{children}</body>
    </html>
  );
}
