import type { NextConfig } from "next";

const isDev = process.env.NODE_ENV !== "production";

// Security headers on every response.
const csp = [
  "default-src 'self'",
  `script-src 'self' 'unsafe-inline'${isDev ? " 'unsafe-eval'" : ""}`,
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self'",
  "connect-src 'self'",
  "object-src 'none'",
  "base-uri 'self'",
  "form-action 'self'",
  "frame-ancestors 'none'",
].join("; ");

const nextConfig: NextConfig = {
  serverExternalPackages: ["sequelize", "pg", "pg-hstore", "pg-boss", "nodemailer", "bcryptjs"],
  poweredByHeader: false,
  // Lets parallel checkouts or test runs build side by side without sharing .next.
  distDir: process.env.CHALKWING_DIST_DIR || ".next",
  // Next.js adds each build folder's types to the tsconfig it is given unless that file `extends`
  // another: tsconfig.next.json only extends tsconfig.json, so no build or test run edits a tracked file.
  typescript: { tsconfigPath: "tsconfig.next.json" },
  experimental: { authInterrupts: true },
  async headers() {
    return [
      {
        source: "/:path*",
        headers: [
          { key: "Content-Security-Policy", value: csp },
          { key: "X-Content-Type-Options", value: "nosniff" },
          { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
          { key: "X-Frame-Options", value: "DENY" },
          { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=()" },
        ],
      },
    ];
  },
};

export default nextConfig;
