import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import react from '@vitejs/plugin-react';
import { defineConfig, type Plugin } from 'vite';
import { VitePWA } from 'vite-plugin-pwa';

const apiPort = Number(process.env.PORT ?? 3000);

const { version } = JSON.parse(
  readFileSync(new URL('./package.json', import.meta.url), 'utf8'),
) as {
  version: string;
};

/**
 * The two typefaces' Latin files are asked for beside the stylesheet instead of after it, so the
 * first paint already uses them and the text does not change width (and move) when they arrive.
 */
const preloadLatinFonts = (): Plugin => ({
  name: 'rowtally-preload-latin-fonts',
  apply: 'build',
  transformIndexHtml: {
    order: 'post',
    handler: (_html, ctx) =>
      Object.keys(ctx.bundle ?? {})
        .filter((file) =>
          /(?:^|\/)(?:fraunces|public-sans)-latin-wght-normal-[\w-]+\.woff2$/.test(file),
        )
        .map((file) => ({
          tag: 'link',
          attrs: {
            rel: 'preload',
            href: `/${file}`,
            as: 'font',
            type: 'font/woff2',
            crossorigin: '',
          },
          injectTo: 'head' as const,
        })),
  },
});

export default defineConfig({
  define: { __APP_VERSION__: JSON.stringify(version) },
  plugins: [
    react(),
    preloadLatinFonts(),
    // The app shell is kept on the device so a grower can open the field log with no signal;
    // records queued offline live in IndexedDB. The API is never cached.
    VitePWA({
      registerType: 'autoUpdate',
      injectRegister: null,
      includeAssets: ['favicon.svg'],
      manifest: {
        name: 'Rowtally',
        short_name: 'Rowtally',
        description: 'A recordbook for side-by-side trials of heirloom vegetable varieties.',
        theme_color: '#2f5d3a',
        background_color: '#faf7ee',
        display: 'standalone',
        start_url: '/',
        icons: [{ src: '/favicon.svg', sizes: 'any', type: 'image/svg+xml', purpose: 'any' }],
      },
      workbox: {
        globPatterns: ['**/*.{js,css,html,svg,woff2}'],
        navigateFallback: '/index.html',
        navigateFallbackDenylist: [/^\/api\//, /^\/r\//],
        maximumFileSizeToCacheInBytes: 4 * 1024 * 1024,
      },
    }),
  ],
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
    proxy: { '/api': `http://127.0.0.1:${apiPort}` },
  },
  // The manifest lets a test add up what each page loads first (tests/e2e/bundle-size.test.ts).
  build: { outDir: 'dist/client', sourcemap: true, manifest: true },
  // `vite build` also builds the server-side renderer of the published results sheet
  // (server/results/sheet-html.ts loads it), so the two can never come from different releases.
  builder: {},
  environments: {
    ssr: {
      build: {
        outDir: 'dist/sheet-html',
        manifest: false,
        copyPublicDir: false,
        rollupOptions: { input: { 'entry-sheet-html': 'src/entry-sheet-html.tsx' } },
      },
    },
  },
});
