import react from '@vitejs/plugin-react';
import { defaultClientConditions, defineConfig } from 'vite';

const apiTarget = 'http://localhost:3000';

export default defineConfig({
  plugins: [react()],
  resolve: {
    // Read @steadyhand/shared from its TypeScript source, so no build step sits between edits.
    conditions: ['steadyhand-source', ...defaultClientConditions],
  },
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    sourcemap: true,
    rolldownOptions: {
      output: {
        // Libraries change rarely and our pages often: separate chunks keep the browser cache useful.
        codeSplitting: {
          groups: [
            { name: 'react', test: /node_modules[\\/](react|react-dom|scheduler|react-router)[\\/]/, priority: 4 },
            { name: 'chakra', test: /node_modules[\\/](@chakra-ui|@ark-ui|@zag-js|@emotion|@floating-ui|@internationalized|@pandacss|proxy-compare|stylis)/, priority: 3 },
            { name: 'query', test: /node_modules[\\/]@tanstack[\\/]/, priority: 2 },
            { name: 'zod', test: /node_modules[\\/]zod[\\/]/, priority: 2 },
            { name: 'forms', test: /node_modules[\\/](react-hook-form|@hookform|@standard-schema)[\\/]/, priority: 2 },
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
