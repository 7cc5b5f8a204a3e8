import { fileURLToPath } from 'node:url';
import react from '@vitejs/plugin-react';
import { defineConfig } from 'vite';

const fromHere = (path: string) => fileURLToPath(new URL(path, import.meta.url));

// The API listens on PORT (default 8080); in production it also serves this build
// on the same origin, so the app always calls relative `/api/...` URLs.
const apiPort = process.env.PORT ?? '8080';

export default defineConfig({
  plugins: [react()],
  resolve: {
    alias: {
      '@/': fromHere('./src/'),
      // Shared API contracts (and later the flow engine) as TypeScript source:
      // Vite compiles them, so the browser never depends on shared's build output.
      '@kiln/shared': fromHere('../shared/src/index.ts'),
    },
  },
  server: {
    proxy: {
      '/api': { target: `http://127.0.0.1:${apiPort}` },
    },
  },
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    // antd is one large chunk by nature; everything route-specific is split lazily.
    chunkSizeWarningLimit: 1200,
  },
});
