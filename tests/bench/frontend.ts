/**
 * Benchmark 6: the front end's JavaScript, gzipped (zlib's default level, as a web server would
 * send it), summed over web/dist/assets/*.js, as `npm run bench` builds it (`npm run build` runs
 * first); without web/dist the row says "not built".
 */
import fs from 'node:fs';
import path from 'node:path';
import zlib from 'node:zlib';

export interface FrontendResult {
  built: boolean;
  files: Array<{ file: string; bytes: number; gzipBytes: number }>;
  totalBytes: number;
  totalGzipBytes: number;
}

export function measureFrontend(distDir = path.resolve('web/dist')): FrontendResult {
  const assets = path.join(distDir, 'assets');
  if (!fs.existsSync(assets)) return { built: false, files: [], totalBytes: 0, totalGzipBytes: 0 };
  const files = fs
    .readdirSync(assets)
    .filter((f) => f.endsWith('.js'))
    .sort()
    .map((f) => {
      const content = fs.readFileSync(path.join(assets, f));
      return { file: f, bytes: content.length, gzipBytes: zlib.gzipSync(content).length };
    });
  return {
    built: true,
    files,
    totalBytes: files.reduce((n, f) => n + f.bytes, 0),
    totalGzipBytes: files.reduce((n, f) => n + f.gzipBytes, 0),
  };
}
