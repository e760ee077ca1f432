import { defineConfig } from 'vitest/config';

// The engine is compiled from common/src, the same source the server and browser run.
export default defineConfig({
  test: { include: ['**/*.check.ts'], environment: 'node', testTimeout: 60000 },
});
