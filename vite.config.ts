import tailwindcss from '@tailwindcss/vite';
import react from '@vitejs/plugin-react';
import { defineConfig } from 'vite';
import { VitePWA } from 'vite-plugin-pwa';

export default defineConfig({
  plugins: [
    react(),
    tailwindcss(),
    // the app shell (HTML, scripts, styles, fonts) cached by a service worker, so a station tablet
    // that reloads with no network still opens; /api is never cached here (lib/persist-cache.ts
    // keeps the answers a station needs, lib/offline-queue.ts what it records)
    VitePWA({
      // registered by src/main.tsx once the first screen is up
      injectRegister: false,
      registerType: 'autoUpdate',
      manifest: false,
      workbox: {
        // fonts in their Latin subsets only: English and Spanish need no other
        globPatterns: ['**/*.{js,css,html}', '**/*-latin-*.woff2'],
        // the camera reader and the office's large charts are not needed at a station offline
        maximumFileSizeToCacheInBytes: 600 * 1024,
        navigateFallback: '/index.html',
        navigateFallbackDenylist: [/^\/api\//],
        cleanupOutdatedCaches: true,
      },
    }),
  ],
  build: { outDir: 'dist', manifest: true, sourcemap: false },
  server: {
    port: Number(process.env.VITE_PORT ?? 5173),
    host: '127.0.0.1',
    proxy: { '/api': `http://127.0.0.1:${process.env.API_PORT ?? 4310}` },
  },
});
