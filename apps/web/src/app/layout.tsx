import type { Metadata, Viewport } from "next";
import { connection } from "next/server";
import localFont from "next/font/local";
import "./globals.css";

const inter = localFont({
  src: "../../node_modules/@fontsource-variable/inter/files/inter-latin-wght-normal.woff2",
  variable: "--font-inter",
  weight: "100 900",
  display: "swap",
});

export const metadata: Metadata = {
  title: { default: "Coldtrail", template: "%s · Coldtrail" },
  description: "Refrigerant records and compliance audits for every branch.",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1, themeColor: "#17212b" };

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  // Every page is rendered per request, so Next.js can put this request's CSP nonce on its scripts (src/proxy.ts).
  await connection();
  return (
    <html lang="en" className={inter.variable}>
      <body className="min-h-dvh font-sans">{children}</body>
    </html>
  );
}
