import type { Metadata, Viewport } from "next";
import { GeistMono } from "geist/font/mono";
import { GeistSans } from "geist/font/sans";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Headroom", template: "%s · Headroom" },
  description: "The vapor-hazard register for volatile liquids in storage.",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1, themeColor: "#0b5d6b" };

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en" className={`${GeistSans.variable} ${GeistMono.variable}`}>
      <body className="min-h-screen font-sans">{children}</body>
    </html>
  );
}
