// Vite builds the single-page app into frontend/dist, which Express serves in production.
import { fileURLToPath, URL } from 'node:url';
import { defineConfig } from 'vite';
import vue from '@vitejs/plugin-vue';
import { VitePWA } from 'vite-plugin-pwa';

export default defineConfig({
  root: fileURLToPath(new URL('.', import.meta.url)),
  plugins: [
    vue(),
    // The app shell for poor signal (docs/decisions/0018-kept-on-this-device.md): the built files are
    // precached, so a page seen once (the public verification page, a builder's own records) opens with
    // no signal. /api is never cached: the worker has no route for it (so it never answers an API call
    // and each one goes to the network as if there were no worker) and it is kept out of the navigation
    // fallback; the app keeps its own last answer and says how old it is. The worker is registered by main.ts in
    // production builds only; the dev server has none.
    VitePWA({
      strategies: 'generateSW',
      injectRegister: false,
      manifest: false,
      workbox: {
        globPatterns: ['**/*.{js,css,html,woff2,svg,png,ico}'],
        // The 3D view's chunk is the largest; everything the app can load stays within this.
        maximumFileSizeToCacheInBytes: 3 * 1024 * 1024,
        navigateFallback: 'index.html',
        navigateFallbackDenylist: [/^\/api(\/|$)/],
        cleanupOutdatedCaches: true,
        clientsClaim: true,
        // A new version waits until every tab of the old one is closed, so no open page asks for a
        // chunk the new worker no longer has.
        skipWaiting: false,
      },
    }),
  ],
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
