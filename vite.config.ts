/**
 * Build of the web app (web/ → web/dist), served by the server as static files. Kept apart from
 * vitest.config.ts, which runs the tests from the repository root.
 *
 * `npx vite` runs a dev server that forwards the API and site links to a server on port 8090
 * (override with HOLDFAST_API, e.g. HOLDFAST_API=http://localhost:8091 npx vite).
 */
import { defineConfig } from 'vite';
import preact from '@preact/preset-vite';

const api = process.env.HOLDFAST_API ?? 'http://localhost:8090';

export default defineConfig({
  root: 'web',
  base: '/',
  plugins: [preact()],
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    // Phones on a site network: modern evergreen browsers only (EventSource, Wake Lock, CSS variables).
    target: 'es2020',
    reportCompressedSize: true,
    assetsInlineLimit: 0,
  },
  server: {
    proxy: {
      '/api': { target: api, changeOrigin: false },
      '/link': { target: api, changeOrigin: false },
    },
  },
});
