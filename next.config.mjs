/** @type {import('next').NextConfig} */
const nextConfig = {
  // Sequelize loads its dialect (pg) dynamically; bundling it breaks that lookup.
  serverExternalPackages: ["sequelize", "pg", "pg-hstore"],
  poweredByHeader: false,
  reactStrictMode: true,
};

export default nextConfig;
