import { defineConfig } from 'vitest/config';

// Workspace packages are consumed from source in tests and in Vite (the "steadyhand-source"
// export condition); the server's production build reads the compiled dist/ instead.
const sourceConditions = ['steadyhand-source'];
const resolve = { conditions: [...sourceConditions, 'module', 'browser', 'development|production'] };
const ssr = { resolve: { conditions: [...sourceConditions, 'module', 'node', 'development|production'] } };

export default defineConfig({
  test: {
    projects: [
      {
        resolve,
        ssr,
        test: {
          name: 'unit-shared',
          include: ['packages/shared/src/**/*.test.ts'],
          environment: 'node',
        },
      },
      {
        resolve,
        ssr,
        test: {
          name: 'unit-server',
          include: ['apps/server/src/**/*.spec.ts'],
          environment: 'node',
          // Password hashing is deliberately slow (scrypt, 128 MiB).
          testTimeout: 20_000,
        },
      },
      {
        resolve,
        ssr,
        test: {
          name: 'api',
          include: ['apps/server/test/**/*.api-spec.ts'],
          environment: 'node',
          // Each file starts its own server on its own temporary SQLite file.
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      './apps/web/vitest.config.ts',
      {
        resolve,
        ssr,
        test: {
          name: 'e2e',
          include: ['apps/web/e2e/**/*.e2e.ts'],
          environment: 'node',
          // One browser and one server at a time: the machines have two cores.
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 90_000,
          // Pages load lazy chunks and data: a 1 s poll is too short on a busy 2-core machine.
          expect: { poll: { timeout: 15_000 } },
        },
      },
    ],
  },
});
