import { defineConfig } from 'vitest/config';

// Kept apart from the web build's vite config (that one sets root: 'web').
export default defineConfig({
  test: {
    include: ['tests/**/*.test.ts', 'server/**/*.test.ts'],
    testTimeout: 20_000,
    hookTimeout: 30_000,
    pool: 'forks',
  },
});
