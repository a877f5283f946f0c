import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    projects: [
      {
        extends: true,
        test: {
          name: 'unit',
          include: ['src/**/*.spec.ts'],
          environment: 'node',
          setupFiles: ['reflect-metadata'],
        },
      },
      {
        extends: true,
        test: {
          name: 'api',
          include: ['test/**/*.e2e-spec.ts', 'test/**/*.int-spec.ts'],
          environment: 'node',
          setupFiles: ['reflect-metadata'],
          // One database for all API files: run them one after another.
          fileParallelism: false,
          globalSetup: ['test/global-setup.ts'],
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
    ],
  },
});
