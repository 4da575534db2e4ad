import type { Metadata, Viewport } from "next";
import localFont from "next/font/local";
import { connection } from "next/server";
import { BrowserTimeZone } from "@/components/time/browser-time-zone";
import "./globals.css";

const inter = localFont({
  src: "../node_modules/@fontsource-variable/inter/files/inter-latin-wght-normal.woff2",
  variable: "--font-inter",
  display: "swap",
});

export const metadata: Metadata = {
  title: { default: "Rhizomorph", template: "%s · Rhizomorph" },
  description: "Pooled harvest records and strain trials for a mushroom growers' cooperative",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1, themeColor: "#2e5e4e" };

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  // Every page is rendered per request: its scripts carry that request's Content Security Policy
  // nonce (proxy.ts), which a page prerendered at build time could not.
  await connection();
  return (
    <html lang="en" className={inter.variable}>
      <body className="min-h-screen font-sans antialiased">
        <BrowserTimeZone />
        {children}
      </body>
    </html>
  );
}
