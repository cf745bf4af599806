// @ts-check
import { readFileSync } from 'node:fs';

const { version } = JSON.parse(readFileSync(new URL('./package.json', import.meta.url), 'utf8'));

/** @type {import('next').NextConfig} */
const nextConfig = {
  // npm test builds into its own folder so it never disturbs a running `npm start`. Read here, not through
  // lib/config.ts: `next build` loads this file before any module of the app.
  distDir: process.env.WORLDSHEET_DIST_DIR ?? '.next',
  reactStrictMode: true,
  poweredByHeader: false,
  env: { WORLDSHEET_VERSION: version },
  // Native and Node-only packages stay outside the server bundle.
  serverExternalPackages: ['pg', 'pg-boss', '@node-rs/argon2', 'mathjs'],
  async headers() {
    return [
      {
        source: '/:path*',
        headers: [
          { key: 'X-Content-Type-Options', value: 'nosniff' },
          { key: 'Referrer-Policy', value: 'same-origin' },
          { key: 'X-Frame-Options', value: 'DENY' },
        ],
      },
    ];
  },
};

export default nextConfig;
