import type { Metadata, Viewport } from "next";
import "./globals.css";
import { sans, mono } from "./fonts";
import { Providers } from "@/components/providers";

export const metadata: Metadata = {
  title: { default: "Chalkwing", template: "%s · Chalkwing" },
  description: "Ground-school teaching, records and progress for flight-training organisations",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1 };

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en-GB" className={`${sans.variable} ${mono.variable}`}>
      <body>
        <Providers>{children}</Providers>
      </body>
    </html>
  );
}
