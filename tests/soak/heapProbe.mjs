// Preloaded into the soak's server (`node --expose-gc --import <this file>`): every
// HEAP_PROBE_INTERVAL_MS (default 30 s) it forces a full garbage collection and appends
// process.memoryUsage() as a JSON line to HEAP_PROBE_FILE. After a full collection the heap holds
// only what is still referenced, so its trend shows a leak that the resident set's saw-tooth
// (V8 growing and shrinking its heap) hides. Plain JavaScript: the compiled server runs without
// the tsx loader.
import fs from 'node:fs';

const file = process.env.HEAP_PROBE_FILE;
const gc = globalThis.gc;
if (file && gc) {
  const timer = setInterval(() => {
    gc();
    const m = process.memoryUsage();
    fs.appendFileSync(file, `${JSON.stringify({ atMs: Date.now(), rss: m.rss, heapUsed: m.heapUsed, external: m.external, arrayBuffers: m.arrayBuffers })}\n`);
  }, Number(process.env.HEAP_PROBE_INTERVAL_MS ?? 30_000));
  timer.unref();
}
