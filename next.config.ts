import type { NextConfig } from "next";
import { API_CSP } from "./lib/http/csp";

// Security headers on every response. Pages get their Content-Security-Policy (with a nonce
// per request) from proxy.ts; route handlers and static files get a script-free one here,
// except handout downloads, which set their own sandbox CSP and Referrer-Policy.

const nextConfig: NextConfig = {
  serverExternalPackages: ["sequelize", "pg", "pg-hstore", "pg-boss", "nodemailer", "bcryptjs"],
  poweredByHeader: false,
  // Lets parallel checkouts or test runs build side by side without sharing .next.
  distDir: process.env.CHALKWING_DIST_DIR || ".next",
  // Next.js adds each build folder's types to the tsconfig it is given unless that file `extends`
  // another: lib/build/tsconfig.next.json only extends tsconfig.json, so no build or test run edits a tracked file.
  // The test command type-checks the whole tree in its static phase and says so with
  // CHALKWING_TYPECHECKED=1, so its build does not check the same files a second time.
  typescript: { tsconfigPath: "lib/build/tsconfig.next.json", ignoreBuildErrors: process.env.CHALKWING_TYPECHECKED === "1" },
  experimental: { authInterrupts: true },
  async headers() {
    return [
      {
        source: "/:path*",
        headers: [
          { key: "X-Content-Type-Options", value: "nosniff" },
          { key: "X-Frame-Options", value: "DENY" },
          { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=()" },
        ],
      },
      { source: "/((?!api/handouts/).*)", headers: [{ key: "Referrer-Policy", value: "strict-origin-when-cross-origin" }] },
      // what proxy.ts does not see (see its matcher): route handlers and static files
      ...["/api/((?!handouts/).*)", "/_next/:path*", "/favicon.ico", "/robots.txt"].map((source) => ({
        source,
        headers: [{ key: "Content-Security-Policy", value: API_CSP }],
      })),
    ];
  },
};

export default nextConfig;
