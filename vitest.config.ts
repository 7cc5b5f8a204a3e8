import { defineConfig } from 'vitest/config';
import swc from 'unplugin-swc';
import { fileURLToPath } from 'node:url';

// Every part's tests run from one `vitest run`. Unit tests sit beside the code;
// cross-part tests live in test/ and expect the services that scripts/test.sh starts.
const sharedSource = fileURLToPath(new URL('./shared/src/index.ts', import.meta.url));
const alias = { '@kiln/shared': sharedSource };

export default defineConfig({
  test: {
    projects: [
      {
        resolve: { alias },
        test: { name: 'shared', include: ['shared/src/**/*.test.ts'], environment: 'node', testTimeout: 120_000 },
      },
      {
        // swc emits the decorator metadata NestJS's dependency injection needs; esbuild does not.
        plugins: [swc.vite({ module: { type: 'es6' } })],
        resolve: { alias },
        test: { name: 'backend', include: ['backend/src/**/*.test.ts'], environment: 'node', testTimeout: 60_000 },
      },
      {
        resolve: { alias },
        test: { name: 'worker', include: ['worker/src/**/*.test.ts'], environment: 'node', testTimeout: 60_000 },
      },
      {
        plugins: [swc.vite({ module: { type: 'es6' } })],
        resolve: { alias },
        test: {
          name: 'integration',
          include: ['test/integration/**/*.test.ts'],
          environment: 'node',
          testTimeout: 120_000,
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'browser',
          include: ['test/browser/**/*.test.ts'],
          environment: 'node',
          testTimeout: 120_000,
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
