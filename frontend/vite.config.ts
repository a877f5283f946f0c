import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';

const here = (relative: string) => fileURLToPath(new URL(relative, import.meta.url));

// The API server serves the built app from dist/ and the API under /api; in development the
// dev server forwards /api to it so both run on one origin, as in production.
export default defineConfig({
  plugins: [react()],
  resolve: {
    alias: [
      { find: '@dialsheet/common', replacement: here('../common/src/index.ts') },
      { find: /^@\//, replacement: `${here('./src')}/` },
    ],
  },
  server: {
    host: '127.0.0.1',
    port: 5173,
    proxy: {
      '/api': { target: 'http://127.0.0.1:3000', changeOrigin: false },
    },
  },
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    sourcemap: true,
  },
});
