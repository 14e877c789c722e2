import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';
import { VitePWA } from 'vite-plugin-pwa';
import { fileURLToPath } from 'node:url';

const apiPort = process.env.PORT ?? '3000';

export default defineConfig({
  plugins: [
    react(),
    tailwindcss(),
    // Service worker (Workbox, generated at build): the app shell and every hashed asset are precached, so
    // the app opens without a connection after one online visit. Customer data (/api, /tiles/homes) is never
    // cached by it; the basemap (no customer data) is kept as it is used, so the streets still draw offline.
    VitePWA({
      strategies: 'generateSW',
      injectRegister: false, // registered in src/main.tsx, production builds only
      manifest: false,
      workbox: {
        globPatterns: ['**/*.{js,mjs,css,html,svg,woff2}'],
        // The map chunk and its worker are over Workbox's 2 MiB default between them.
        maximumFileSizeToCacheInBytes: 4 * 1024 * 1024,
        navigateFallback: '/index.html',
        navigateFallbackDenylist: [/^\/api\//, /^\/tiles\//, /^\/glyphs\//, /^\/map\//],
        cleanupOutdatedCaches: true,
        runtimeCaching: [
          {
            urlPattern: ({ url, sameOrigin }) => sameOrigin && url.pathname === '/map/style.json',
            handler: 'NetworkFirst',
            options: { cacheName: 'basemap-style', networkTimeoutSeconds: 4, cacheableResponse: { statuses: [200] } },
          },
          {
            urlPattern: ({ url, sameOrigin }) => sameOrigin && (url.pathname.startsWith('/tiles/base/') || url.pathname.startsWith('/glyphs/')),
            handler: 'StaleWhileRevalidate',
            options: { cacheName: 'basemap-tiles', cacheableResponse: { statuses: [200] }, expiration: { maxEntries: 3000, maxAgeSeconds: 30 * 24 * 3600 } },
          },
        ],
      },
    }),
  ],
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('./src', import.meta.url)),
      '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
    },
  },
  server: {
    port: 5173,
    proxy: {
      '/api': `http://127.0.0.1:${apiPort}`,
      '/tiles': `http://127.0.0.1:${apiPort}`,
      '/glyphs': `http://127.0.0.1:${apiPort}`,
      '/map': `http://127.0.0.1:${apiPort}`,
    },
  },
  build: { outDir: 'dist/client', emptyOutDir: true, chunkSizeWarningLimit: 1600 },
  test: {
    // Three suites, run one after another by server/scripts/test.sh: unit tests sit beside the code;
    // integration and browser tests need the PostgreSQL the test script starts.
    projects: [
      {
        extends: true,
        test: { name: 'unit', include: ['shared/**/*.test.ts', 'server/**/*.test.ts', 'src/**/*.test.{ts,tsx}', 'data/**/*.test.ts'], environment: 'node' },
      },
      {
        extends: true,
        test: {
          name: 'integration',
          include: ['tests/integration/**/*.test.ts'],
          globalSetup: ['tests/setup/reset-database.ts'],
          fileParallelism: false,
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        extends: true,
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          globalSetup: ['tests/setup/reset-database.ts'],
          fileParallelism: false,
          testTimeout: 90_000,
          hookTimeout: 90_000,
        },
      },
    ],
  },
});
