import type { NextConfig } from "next";

// Headers for every response; the Content-Security-Policy (with its per-request nonce) is set in proxy.ts.
const SECURITY_HEADERS = [
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=(), payment=()" },
  { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
];

const nextConfig: NextConfig = {
  // Native and optional-driver packages stay outside the server bundle.
  serverExternalPackages: ["knex", "better-sqlite3", "pg", "pg-copy-streams", "@node-rs/argon2", "smtp-server", "nodemailer"],
  poweredByHeader: false,
  async headers() {
    return [{ source: "/:path*", headers: SECURITY_HEADERS }];
  },
};

export default nextConfig;
