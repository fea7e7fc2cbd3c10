import tailwindcss from '@tailwindcss/vite';
import react from '@vitejs/plugin-react';
import { defineConfig } from 'vite';

export default defineConfig({
  plugins: [react(), tailwindcss()],
  build: { outDir: 'dist', manifest: true, sourcemap: false },
  server: {
    port: Number(process.env.VITE_PORT ?? 5173),
    host: '127.0.0.1',
    proxy: { '/api': `http://127.0.0.1:${process.env.API_PORT ?? 4310}` },
  },
});
