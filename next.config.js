// Next.js settings: Sequelize stays outside the server bundle (it loads dialects dynamically), and so do pdfkit (fontkit and its font data load from node_modules) and piscina (its thread entry is a file of its own).
// Security headers: the fixed ones on every path, and no framing of API answers; the pages'
// Content-Security-Policy (with its per-request nonce) and HSTS come from proxy.ts. The values live in
// lib/http/security-headers.ts; this file is plain JavaScript, so they are repeated here and a unit test
// (tests/unit/http/security-headers.test.ts) keeps the two the same.
const FIXED_SECURITY_HEADERS = [
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
  {
    key: "Permissions-Policy",
    value:
      "camera=(), microphone=(), geolocation=(), payment=(), usb=(), serial=(), bluetooth=(), interest-cohort=()",
  },
  { key: "X-Frame-Options", value: "DENY" },
];
// Cache-Control: no-store is set by lib/http/api-handler.ts, so that a route's own value (the reports'
// "private, no-store") is not overwritten by this file's.
const API_HEADERS = [
  { key: "Content-Security-Policy", value: "default-src 'none'; frame-ancestors 'none'" },
];

/** @type {import('next').NextConfig} */
const nextConfig = {
  serverExternalPackages: [
    "sequelize",
    "argon2",
    "smtp-server",
    "mailparser",
    "nodemailer",
    "pdfkit",
    "piscina",
  ],
  allowedDevOrigins: ["127.0.0.1"],
  poweredByHeader: false,
  // `npm test` runs `tsc --noEmit` over the whole project (tests included) before it builds;
  // checking again inside every build only doubles the wait.
  typescript: { ignoreBuildErrors: true },
  async headers() {
    return [
      { source: "/:path*", headers: FIXED_SECURITY_HEADERS },
      { source: "/api/:path*", headers: API_HEADERS },
    ];
  },
  experimental: {
    // The largest server-action body is the line import form: a CSV of up to 5 MB (MAX_IMPORT_BYTES in
    // lib/validation/line-schemas.ts, the API's limit too) plus its other fields, and the CR a browser
    // adds before every LF when it sends the previewed text back. Everything bigger goes through the
    // API routes and their own caps.
    serverActions: { bodySizeLimit: "6mb" },
  },
};

module.exports = nextConfig;
