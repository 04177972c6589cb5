/**
 * Garbage-collector settings of the server process, applied before the rest of the server is
 * loaded (main.ts imports this first and the rest after). Design §6 asks for at most 150 MB
 * resident with 100 sensors and 1,000 structures. The live heap is about 31 MB (heap snapshot under
 * the benchmark); with V8's defaults its reserve took most of the resident set: a young generation
 * grown to 2 × 16 MB, and an old generation let grow to 2–3 × what the last full collection left.
 *
 * - Young generation capped at 8 MB (2 × 4 MB): V8 doubles it while many objects survive; once it
 *   has reached the cap, growth is turned off (`--semi-space-growth-factor=1`), and turned on
 *   again if V8 shrinks it (it does when the allocation rate falls). Checked after every
 *   collection (a `gc` performance entry). Turning growth off from the start kept it at 2 × 1 MB,
 *   which cost 77–88 against 48 µs CPU per reading in `npm run bench`; 8 MB and 16 MB cost none
 *   (50 µs), 8 MB the least memory.
 * - `--heap-growing-percent=30`: a full collection once the old generation is 1.3 × what the last
 *   one left.
 *
 * `npm run bench`, embedded broker, median of 2 interleaved repeats: peak resident during ingest
 * 126 MB with both, 155 MB with the second alone, 186 MB with neither, at the same CPU per reading.
 * V8 reads both flags each time it decides (new-space growth, the next collection's limit), so
 * setting them in a running process takes effect; Node warns that changing V8 flags at run time
 * may do nothing or misbehave: if an upgrade stops reading them, the heap grows as before and
 * `npm run bench` shows it. Starting a worker thread puts them back (v8Flags.ts sets them again). Only the server process (`npm start`, `npm run demo`) sets them; tests
 * and tools run with V8's defaults.
 *
 * Outside V8, glibc's allocator is set by package.json's start and demo scripts, before node
 * starts (glibc reads it only then): `MALLOC_MMAP_THRESHOLD_=1048576` (README, configuration).
 */
import v8 from 'node:v8';
import { PerformanceObserver } from 'node:perf_hooks';
import { setRuntimeV8Flag } from './v8Flags.ts';

const youngGenerationCapBytes = 8 * 2 ** 20;

const youngGenerationBytes = (): number => v8.getHeapSpaceStatistics().find((s) => s.space_name === 'new_space')?.space_size ?? 0;

// Set after every collection even when unchanged: a worker's start undoes it (v8Flags.ts).
function allowGrowth(allow: boolean): void {
  setRuntimeV8Flag('semi-space-growth-factor', allow ? 2 : 1);
}

allowGrowth(youngGenerationBytes() < youngGenerationCapBytes);
new PerformanceObserver(() => allowGrowth(youngGenerationBytes() < youngGenerationCapBytes)).observe({ entryTypes: ['gc'] });
setRuntimeV8Flag('heap-growing-percent', 30);
