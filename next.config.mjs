/** @type {import('next').NextConfig} */
const nextConfig = {
  // The test suite builds into its own folder so that it never disturbs a running `npm start`.
  distDir: process.env.NEXT_DIST_DIR || '.next',
  poweredByHeader: false,
  reactStrictMode: true,
  // pg-boss and piscina load files at run time (SQL plans, worker threads): keep them out of the bundle.
  serverExternalPackages: ['pg', 'smtp-server', 'mailparser', 'bcryptjs', 'pg-boss', 'piscina'],
  async headers() {
    return [
      {
        source: '/:path*',
        headers: [
          { key: 'X-Content-Type-Options', value: 'nosniff' },
          { key: 'Referrer-Policy', value: 'strict-origin-when-cross-origin' },
          { key: 'X-Frame-Options', value: 'DENY' },
          { key: 'Permissions-Policy', value: 'camera=(), microphone=(), geolocation=()' },
        ],
      },
    ];
  },
};

export default nextConfig;
