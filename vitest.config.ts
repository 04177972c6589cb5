import { defineConfig } from 'vitest/config';

// Kept apart from the web build's vite config (that one sets root: 'web').
export default defineConfig({
  test: {
    include: ['tests/**/*.test.ts', 'server/**/*.test.ts'],
    testTimeout: 20_000,
    hookTimeout: 30_000,
    pool: 'forks',
    // Two test files at a time. Vitest's default on a 2-core machine is one (cores − 1), and most
    // of a test's time here is spent waiting on Chromium, a broker, a child server or a timer:
    // measured on this machine kind, the whole run took 301 s with two against about 510 s with
    // one (and CI of record, on one, took 946 s of its 15-min budget).
    maxWorkers: 2,
  },
});
