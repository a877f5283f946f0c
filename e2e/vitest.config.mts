import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

// Browser tests against a running server (E2E_BASE_URL). One file at a time: they share the
// server's data and one browser binary.
export default defineConfig({
  test: {
    root: fileURLToPath(new URL('.', import.meta.url)),
    include: ['**/*.e2e.ts'],
    environment: 'node',
    testTimeout: 60_000,
    hookTimeout: 60_000,
    fileParallelism: false,
  },
});
