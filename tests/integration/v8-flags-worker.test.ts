/**
 * A worker thread's start must not undo the server's garbage-collector settings (server/v8Flags.ts,
 * heapSettings.ts): in Node 20 it puts V8's flags back to the command line's for the whole
 * process. Checked in a child process (flags are process-wide, and tests run with V8's defaults):
 * with the growth factor 1, the young generation has to stay below the server's 8 MB cap while
 * 3 million short-lived objects are made after a storage worker has answered; reset, it grows to
 * V8's maximum (2 × 16 MB, from memory of Node 20's V8 defaults). Measured here: 4 MB kept (it can
 * take a step while the worker starts), 32 MB reset (with the second re-set taken out).
 */
import { execFileSync } from 'node:child_process';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

describe('V8 flags set at run time', () => {
  it('are set again once a storage worker is online, so the young generation stays capped', () => {
    const out = execFileSync(process.execPath, ['--import', 'tsx', path.resolve('tests/fixtures/youngGenerationAfterWorker.ts')], { encoding: 'utf8', env: { ...process.env, NODE_OPTIONS: '' }, timeout: 60_000 });
    const result = JSON.parse(out.trim().split('\n').at(-1)!) as { youngMb: number; kept: boolean };
    expect(result.kept).toBe(true);
    expect(result.youngMb).toBeLessThan(8);
  }, 70_000);
});
