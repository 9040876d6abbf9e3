import { SECURITY_HEADERS } from './lib/http/edge.mjs';

// Server actions are accepted from the app's public host (APP_URL), also behind a reverse proxy
// that does not forward it as X-Forwarded-Host; proxy.ts refuses every other site with 403 first.
const appHost = (() => {
  try {
    return new URL(process.env.APP_URL || 'http://localhost:3000').host;
  } catch {
    return 'localhost:3000'; // a malformed APP_URL stops the server at start-up (instrumentation.ts)
  }
})();

/** @type {import('next').NextConfig} */
const nextConfig = {
  // The test suite builds into its own folder so that it never disturbs a running `npm start`.
  distDir: process.env.NEXT_DIST_DIR || '.next',
  poweredByHeader: false,
  reactStrictMode: true,
  // pg-boss and piscina load files at run time (SQL plans, worker threads): keep them out of the bundle.
  serverExternalPackages: ['pg', 'smtp-server', 'mailparser', 'bcryptjs', 'pg-boss', 'piscina'],
  experimental: {
    serverActions: { allowedOrigins: [appHost] },
  },
  // The same headers as proxy.ts and scripts/serve.ts set, also for what Next answers before the proxy.
  async headers() {
    return [{ source: '/:path*', headers: SECURITY_HEADERS.map(([key, value]) => ({ key, value })) }];
  },
};

export default nextConfig;
