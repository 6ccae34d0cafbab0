import type { NextConfig } from "next";

const nextConfig: NextConfig = {
  // Native and optional-driver packages stay outside the server bundle.
  serverExternalPackages: ["knex", "better-sqlite3", "@node-rs/argon2", "smtp-server", "nodemailer"],
  poweredByHeader: false,
};

export default nextConfig;
