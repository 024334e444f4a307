import type { Metadata, Viewport } from "next";
import { headers } from "next/headers";
import "./globals.css";
import { sans, mono } from "./fonts";
import { Providers } from "@/components/providers";

export const metadata: Metadata = {
  title: { default: "Chalkwing", template: "%s · Chalkwing" },
  description: "Ground-school teaching, records and progress for flight-training organisations",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1 };

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  // Reading the request makes every page render per request, so each gets the nonce that
  // proxy.ts put in its Content-Security-Policy (Next.js adds it to its own scripts).
  await headers();
  return (
    <html lang="en-GB" className={`${sans.variable} ${mono.variable}`}>
      <body>
        <Providers>{children}</Providers>
      </body>
    </html>
  );
}
