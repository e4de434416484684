// Next.js settings: Sequelize stays outside the server bundle (it loads dialects dynamically), and so do pdfkit (fontkit and its font data load from node_modules) and piscina (its thread entry is a file of its own).
/** @type {import('next').NextConfig} */
const nextConfig = {
  serverExternalPackages: ["sequelize", "argon2", "smtp-server", "mailparser", "nodemailer", "pdfkit", "piscina"],
  allowedDevOrigins: ["127.0.0.1"],
  poweredByHeader: false,
  // `npm test` runs `tsc --noEmit` over the whole project (tests included) before it builds;
  // checking again inside every build only doubles the wait.
  typescript: { ignoreBuildErrors: true },
  experimental: {
    serverActions: { bodySizeLimit: "2mb" },
  },
};

module.exports = nextConfig;
