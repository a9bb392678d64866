import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';

const here = (p: string): string => fileURLToPath(new URL(p, import.meta.url));

export default defineConfig({
  plugins: [react()],
  resolve: {
    alias: [
      // the API contract alone (constants + types), so UI code need not pull the engine in
      { find: /^@foldfolio\/shared\/api$/, replacement: here('../shared/src/api/types.ts') },
      { find: /^@foldfolio\/shared$/, replacement: here('../shared/src/index.ts') },
    ],
    // The repo root also holds React 18 (pulled in by another workspace); Blueprint lives at the
    // root too, so without dedupe the bundle would carry two Reacts and hooks would break.
    dedupe: ['react', 'react-dom'],
  },
  server: {
    port: 5173,
    proxy: { '/api': { target: 'http://127.0.0.1:8080', changeOrigin: false } },
  },
  build: { outDir: 'dist', emptyOutDir: true, sourcemap: false, chunkSizeWarningLimit: 2000 },
});
