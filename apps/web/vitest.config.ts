import react from '@vitejs/plugin-react';
import { defineProject } from 'vitest/config';

export default defineProject({
  plugins: [react()],
  resolve: { conditions: ['steadyhand-source', 'module', 'browser', 'development|production'] },
  test: {
    name: 'unit-web',
    root: import.meta.dirname,
    include: ['src/**/*.test.{ts,tsx}'],
    environment: 'happy-dom',
    setupFiles: ['./src/testing/setup-tests.ts'],
  },
});
