// Vite builds the single-page app into frontend/dist, which Express serves in production.
import { fileURLToPath, URL } from 'node:url';
import { defineConfig } from 'vite';
import vue from '@vitejs/plugin-vue';

export default defineConfig({
  root: fileURLToPath(new URL('.', import.meta.url)),
  plugins: [vue()],
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('./src', import.meta.url)),
      '@domain': fileURLToPath(new URL('../backend/src/domain', import.meta.url)),
      '@contracts': fileURLToPath(new URL('../backend/src/contracts', import.meta.url)),
    },
  },
  server: {
    port: 5173,
    proxy: { '/api': 'http://127.0.0.1:3000' },
  },
  // The manifest lets the bench add up each route's JavaScript from the built files (tests/bench/bundle.ts).
  build: { outDir: 'dist', emptyOutDir: true, manifest: true },
});
