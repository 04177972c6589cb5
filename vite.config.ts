/**
 * Build of the web app (web/ → web/dist), served by the server as static files. Kept apart from
 * vitest.config.ts, which runs the tests from the repository root.
 *
 * `npx vite` runs a dev server that forwards the API and site links to a server on port 8090
 * (override with HOLDFAST_API, e.g. HOLDFAST_API=http://localhost:8091 npx vite).
 */
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import { defineConfig, type Plugin } from 'vite';
import preact from '@preact/preset-vite';

/**
 * The service worker (web/src/sw/serviceWorker.js) emitted as /sw.js, at the root so its scope is
 * the whole app, with this build's file list put in: the worker keeps exactly these files, and a
 * new build (new file names) is a new worker, which replaces the old shell.
 */
function appShell(): Plugin {
  return {
    name: 'holdfast-app-shell',
    apply: 'build',
    generateBundle(_options, bundle) {
      const files = Object.keys(bundle).filter((f) => f.startsWith('assets/')).sort().map((f) => `/${f}`);
      const id = createHash('sha256').update(files.join('\n')).digest('hex').slice(0, 12);
      const source = fs.readFileSync(new URL('./web/src/sw/serviceWorker.js', import.meta.url), 'utf8');
      this.emitFile({ type: 'asset', fileName: 'sw.js', source: `self.__HOLDFAST_BUILD__ = ${JSON.stringify({ id, files })};\n${source}` });
    },
  };
}

const api = process.env.HOLDFAST_API ?? 'http://localhost:8090';

export default defineConfig({
  root: 'web',
  base: '/',
  plugins: [preact(), appShell()],
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
