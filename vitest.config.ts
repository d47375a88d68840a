import { defineConfig } from 'vitest/config';
import path from 'node:path';

// 'server-only' marks modules that pages and routes read data through; Next resolves it to nothing on
// the server and refuses it in the browser bundle. Tests run them directly, so it is nothing here too.
const alias = { '@': path.resolve(import.meta.dirname), 'server-only': path.resolve(import.meta.dirname, 'node_modules/server-only/empty.js') };

export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      {
        resolve: { alias },
        test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node' },
      },
      {
        resolve: { alias },
        test: {
          name: 'integration',
          include: ['tests/integration/**/*.test.ts'],
          environment: 'node',
          fileParallelism: false,
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'browser',
          include: ['tests/browser/**/*.test.ts'],
          environment: 'node',
          fileParallelism: false,
          testTimeout: 90_000,
          hookTimeout: 120_000,
        },
      },
    ],
  },
});
