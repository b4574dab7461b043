import { defineConfig } from 'vitest/config';
import { fileURLToPath } from 'node:url';

export default defineConfig({
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('.', import.meta.url)),
      // 'server-only' throws outside React Server Components; tests import server modules directly.
      'server-only': fileURLToPath(new URL('./tests/support/empty.ts', import.meta.url)),
    },
  },
  test: {
    include: ['tests/unit/**/*.test.ts', 'tests/reference/**/*.test.ts', 'tests/integration/**/*.test.ts'],
    environment: 'node',
    // Integration files share one database; run files one at a time, tests stay fast.
    fileParallelism: false,
    testTimeout: 20_000,
    reporters: ['default'],
  },
});
