/**
 * Draws the app's PNG icons from its own SVGs (web/public/icons/*.svg) with headless Chromium:
 * `node --import tsx web/scripts/renderIcons.ts` after changing an SVG. The PNGs are committed:
 * the manifest names them (installable apps want 192 and 512 px PNGs; iOS its 180 px
 * apple-touch-icon; Android's status bar a white-on-transparent badge).
 */
import fs from 'node:fs';
import path from 'node:path';
import { chromium } from 'playwright-core';

const dir = path.resolve('web/public/icons');
const jobs: Array<{ svg: string; png: string; size: number }> = [
  { svg: 'icon.svg', png: 'icon-192.png', size: 192 },
  { svg: 'icon.svg', png: 'icon-512.png', size: 512 },
  { svg: 'icon-maskable.svg', png: 'icon-maskable-512.png', size: 512 },
  { svg: 'icon-maskable.svg', png: 'apple-touch-icon.png', size: 180 },
  { svg: 'badge.svg', png: 'badge-96.png', size: 96 },
];

const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', headless: true, args: ['--no-sandbox', '--disable-gpu'] });
try {
  const page = await browser.newPage({ deviceScaleFactor: 1 });
  for (const job of jobs) {
    const svg = fs.readFileSync(path.join(dir, job.svg), 'utf8');
    await page.setViewportSize({ width: job.size, height: job.size });
    await page.setContent(`<html><body style="margin:0;background:transparent"><img id="i" width="${job.size}" height="${job.size}" src="data:image/svg+xml;base64,${Buffer.from(svg).toString('base64')}"></body></html>`);
    await page.locator('#i').screenshot({ path: path.join(dir, job.png), omitBackground: true });
    console.log(`${job.png} ${job.size}×${job.size}`);
  }
} finally {
  await browser.close();
}
