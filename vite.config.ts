import { fileURLToPath, URL } from 'node:url';
import { defineConfig } from 'vite';
import vue from '@vitejs/plugin-vue';
import { chunkModulesPlugin, precompressPlugin } from './scripts/vitePrecompress.ts';

// The API server (server/index.ts) listens on PORT; in `npm run dev` Vite proxies /api to it.
const apiPort = Number(process.env.PORT ?? 5180);

export default defineConfig({
  plugins: [vue(), chunkModulesPlugin(), precompressPlugin()],
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
  build: { outDir: 'dist', emptyOutDir: true, chunkSizeWarningLimit: 5000, manifest: true },
});
