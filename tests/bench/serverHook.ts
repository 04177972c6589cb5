/**
 * Instruments a server process the benchmarks start, preloaded with
 * `NODE_OPTIONS="--import tsx --import <this file>"` (`--cpu-prof` is not allowed in
 * NODE_OPTIONS):
 *
 * - BENCH_PROFILE_DIR: starts V8's sampling profiler at once and writes
 *   `<dir>/server-<pid>.cpuprofile` when the process exits (the server exits on SIGTERM). Read it
 *   with profileSummary.ts.
 * - BENCH_ALLOCATION_DIR: samples what the process allocates (V8's sampling heap profiler, one
 *   sample per 4 kB allocated, counting objects already collected) and writes
 *   `<dir>/server-<pid>.heapprofile` at exit: bytes allocated per function, to tell where the
 *   garbage collector's work comes from. Read it with profileSummary.ts `--allocations`.
 * - BENCH_MEMORY_FILE: appends `process.memoryUsage()` as a JSON line every 500 ms (V8 heap,
 *   external and array buffers beside the resident set), to tell where resident memory goes.
 *   With `--expose-gc` in NODE_OPTIONS as well, every fourth sample is taken right after a full
 *   garbage collection (`afterGc: true`): live heap only, to tell growth from garbage.
 */
import fs from 'node:fs';
import path from 'node:path';
import { Session } from 'node:inspector';

const dir = process.env.BENCH_PROFILE_DIR;
if (dir) {
  const session = new Session();
  session.connect();
  session.post('Profiler.setSamplingInterval', { interval: 200 });
  session.post('Profiler.enable');
  session.post('Profiler.start');
  let written = false;
  const write = (): void => {
    if (written) return;
    written = true;
    // Same-thread inspector sessions answer synchronously, so this works inside 'exit'.
    session.post('Profiler.stop', (err, result) => {
      if (err || !result) return;
      fs.mkdirSync(dir, { recursive: true });
      fs.writeFileSync(path.join(dir, `server-${process.pid}.cpuprofile`), JSON.stringify(result.profile));
    });
  };
  process.on('exit', write);
}

const allocationDir = process.env.BENCH_ALLOCATION_DIR;
if (allocationDir) {
  const session = new Session();
  session.connect();
  session.post('HeapProfiler.startSampling', { samplingInterval: 4096, includeObjectsCollectedByMajorGC: true, includeObjectsCollectedByMinorGC: true } as never);
  let written = false;
  process.on('exit', () => {
    if (written) return;
    written = true;
    session.post('HeapProfiler.stopSampling', (err, result) => {
      if (err || !result) return;
      fs.mkdirSync(allocationDir, { recursive: true });
      fs.writeFileSync(path.join(allocationDir, `server-${process.pid}.heapprofile`), JSON.stringify(result.profile));
    });
  });
}

const memoryFile = process.env.BENCH_MEMORY_FILE;
if (memoryFile) {
  fs.mkdirSync(path.dirname(memoryFile), { recursive: true });
  const gc = (globalThis as { gc?: () => void }).gc;
  let n = 0;
  const timer = setInterval(() => {
    const afterGc = gc !== undefined && n++ % 4 === 3;
    if (afterGc) gc();
    const m = process.memoryUsage();
    fs.appendFileSync(memoryFile, JSON.stringify({ atMs: Date.now(), afterGc, rss: m.rss, heapTotal: m.heapTotal, heapUsed: m.heapUsed, external: m.external, arrayBuffers: m.arrayBuffers }) + '\n');
  }, 500);
  timer.unref();
}
