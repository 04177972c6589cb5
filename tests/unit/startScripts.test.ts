/**
 * package.json's `start` and `demo` scripts start the compiled server with the same environment
 * in front of node, and that environment is what the benchmarks' and crash tests' compiled
 * server gets (tests/helpers/serverProcess.ts startScriptEnv). The variable itself is glibc's:
 * mallopt(3), M_MMAP_THRESHOLD, "MALLOC_MMAP_THRESHOLD_" — setting it also turns off glibc's
 * dynamic raising of the threshold (same page), which is what kept a freed 8 MiB scrypt block in
 * the process.
 */
import fs from 'node:fs';
import { describe, expect, it } from 'vitest';
import { startScriptEnv } from '../helpers/serverProcess.ts';

const scripts = (JSON.parse(fs.readFileSync('package.json', 'utf8')) as { scripts: Record<string, string> }).scripts;

describe('the scripts that start the server', () => {
  it('give the compiled server a fixed mmap threshold of 1 MiB, read back from the start script as the benchmarks read it', () => {
    expect(startScriptEnv()).toEqual({ MALLOC_MMAP_THRESHOLD_: String(2 ** 20) });
  });

  it('start the demo with the same variables in front of the same program', () => {
    expect(scripts.demo).toBe(`${scripts.start} --demo`);
  });
});
