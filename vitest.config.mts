import { defineConfig } from 'vitest/config';
import swc from 'unplugin-swc';
import { fileURLToPath } from 'node:url';

// Every part's tests run from one `vitest run`. Unit tests sit beside the code;
// cross-part tests live in test/ and expect the services that scripts/test.sh starts.
// Tests import the shared package's TypeScript source, so no build is needed for them.
const source = (file: string) => fileURLToPath(new URL(`./shared/src/${file}`, import.meta.url));
const alias = [
  { find: /^@kiln\/shared$/, replacement: source('index.ts') },
  { find: /^@kiln\/shared\/db$/, replacement: source('db/index.ts') },
];

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
