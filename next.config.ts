import type { NextConfig } from 'next';
import { API_CSP, staticSecurityHeaders } from './lib/http/security-headers';

const nextConfig: NextConfig = {
  // The database and mail stacks load dynamic modules that must stay out of the bundle.
  serverExternalPackages: ['sequelize', 'pg', 'pg-hstore', 'nodemailer', 'bcryptjs', 'pg-boss'],
  poweredByHeader: false,
  // Lets several checkouts' builds (e.g. parallel test runs) live side by side.
  distDir: process.env.NEXT_DIST_DIR ?? '.next',
  // scripts/test.sh runs `tsc --noEmit` over the whole tree; the build need not repeat it.
  typescript: { ignoreBuildErrors: true },
  // Pages get their nonce-based Content-Security-Policy from proxy.ts.
  async headers() {
    return [
      { source: '/:path*', headers: staticSecurityHeaders() },
      { source: '/api/:path*', headers: [{ key: 'Content-Security-Policy', value: API_CSP }] },
    ];
  },
};

export default nextConfig;
