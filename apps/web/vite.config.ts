import react from '@vitejs/plugin-react';
import { fileURLToPath } from 'node:url';
import { defaultClientConditions, defineConfig, type Plugin } from 'vite';

const apiTarget = 'http://localhost:3000';
const SW_ENTRY = 'service-worker';

/**
 * The service worker is built as its own entry at /sw.js; this writes the list of every built
 * file into it, so the whole app (each route chunk too) is cached at install and a new build
 * changes sw.js, which makes browsers install the new one.
 */
function precacheList(): Plugin {
  return {
    name: 'steadyhand-precache-list',
    apply: 'build',
    generateBundle(_options, bundle) {
      const sw = bundle['sw.js'];
      if (!sw || sw.type !== 'chunk') return;
      // '/' is the page itself (index.html is emitted after this hook runs).
      const files = [
        '/',
        ...Object.keys(bundle)
          .filter(
            (f) => f !== 'sw.js' && f !== 'index.html' && !f.endsWith('.map') && !f.startsWith('.'),
          )
          .map((f) => `/${f}`),
      ];
      sw.code = `self.__STEADYHAND_PRECACHE__ = ${JSON.stringify(files)};\n${sw.code}`;
    },
  };
}

export default defineConfig({
  plugins: [react(), precacheList()],
  resolve: {
    // Read @steadyhand/shared from its TypeScript source, so no build step sits between edits.
    conditions: ['steadyhand-source', ...defaultClientConditions],
  },
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    sourcemap: true,
    rolldownOptions: {
      input: {
        index: fileURLToPath(new URL('./index.html', import.meta.url)),
        [SW_ENTRY]: fileURLToPath(new URL('./src/sw/service-worker.ts', import.meta.url)),
      },
      output: {
        entryFileNames: (chunk) => (chunk.name === SW_ENTRY ? 'sw.js' : 'assets/[name]-[hash].js'),
        // Libraries change rarely and our pages often: separate chunks keep the browser cache useful.
        codeSplitting: {
          groups: [
            {
              name: 'react',
              test: /node_modules[\\/](react|react-dom|scheduler|react-router)[\\/]/,
              priority: 4,
            },
            { name: 'query', test: /node_modules[\\/]@tanstack[\\/]/, priority: 2 },
            { name: 'zod', test: /node_modules[\\/]zod[\\/]/, priority: 2 },
            {
              name: 'forms',
              test: /node_modules[\\/](react-hook-form|@hookform|@standard-schema)[\\/]/,
              priority: 2,
            },
          ],
        },
      },
    },
  },
  server: {
    port: 5173,
    strictPort: true,
    proxy: {
      '/api': { target: apiTarget, changeOrigin: false },
      '/socket.io': { target: apiTarget, ws: true, changeOrigin: false },
    },
  },
  preview: {
    port: 4173,
    proxy: {
      '/api': { target: apiTarget },
      '/socket.io': { target: apiTarget, ws: true },
    },
  },
});
