import { fileURLToPath, URL } from 'node:url';
import { defineConfig } from 'vite';
import vue from '@vitejs/plugin-vue';
import { chunkModulesPlugin, precompressPlugin } from './scripts/vitePrecompress.ts';

// The API server (server/index.ts) listens on PORT; in `npm run dev` Vite proxies /api to it.
const apiPort = Number(process.env.PORT ?? 5180);

export default defineConfig({
  // No component here or in Element Plus' ones the app uses is written with the Options API (data, methods, mixins):
  // leaving its support out of the runtime makes every page's first load smaller.
  plugins: [vue({ features: { optionsAPI: false } }), chunkModulesPlugin(), precompressPlugin()],
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('./src', import.meta.url)),
      // plotly.js' trace registry names the map style sheet for map traces, which the app's bundle leaves out.
      'maplibre-gl/dist/maplibre-gl.css': fileURLToPath(new URL('./src/styles/empty.css', import.meta.url)),
    },
  },
  server: {
    host: '127.0.0.1',
    port: Number(process.env.VITE_PORT ?? 5173),
    proxy: { '/api': { target: `http://127.0.0.1:${apiPort}`, changeOrigin: false } },
  },
  // The manifest lets `npm run bench` add up what each page loads (scripts/bench/bundle.ts).
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    chunkSizeWarningLimit: 5000,
    manifest: true,
    rolldownOptions: {
      // The formatting layer and the contracts are pure (ESLint holds them to that): importing one word list through
      // `@/format` or one enum through `@/contracts` must not put the whole layer in every page's first load — nor,
      // through the request schemas (which validate design documents with the engine's schema), the engine itself.
      treeshake: {
        moduleSideEffects: [
          { test: /[\\/]src[\\/]format[\\/]/, sideEffects: false },
          { test: /[\\/]src[\\/]contracts[\\/]/, sideEffects: false },
        ],
      },
    },
  },
});
