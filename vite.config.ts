import { fileURLToPath } from 'node:url';
import react from '@vitejs/plugin-react';
import { defineConfig } from 'vite';

const apiPort = Number(process.env.PORT ?? 3000);

export default defineConfig({
  plugins: [react()],
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('./src', import.meta.url)),
      '@common': fileURLToPath(new URL('./common', import.meta.url)),
    },
  },
  server: {
    host: '127.0.0.1',
    port: Number(process.env.VITE_PORT ?? 5173),
    // The API runs beside the dev server; the browser only ever talks to one origin.
    proxy: {
      '/api': `http://127.0.0.1:${apiPort}`,
      '/media': `http://127.0.0.1:${apiPort}`,
      '/dev/mailbox/api': `http://127.0.0.1:${apiPort}`,
    },
  },
  build: { outDir: 'dist/client', sourcemap: true },
});
