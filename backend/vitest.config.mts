import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

// Unit specs sit beside the code; integration tests in test/ need the MariaDB and fakes that
// scripts/test.mjs starts, and run one file at a time against the shared test database.
// Vite's oxc compiles the decorators, honouring experimentalDecorators and emitDecoratorMetadata.
export default defineConfig({
  resolve: { alias: { '@ampwright/common': fileURLToPath(new URL('../common/src/index.ts', import.meta.url)) } },
  test: {
    projects: [
      // Some specs load MathJax, run poppler or start evaluation processes: a bound for a slow machine, not a speed test.
      { extends: true, test: { name: 'unit', include: ['src/**/*.spec.ts'], testTimeout: 30000 } },
      {
        extends: true,
        test: { name: 'integration', include: ['test/**/*.test.ts'], fileParallelism: false, testTimeout: 30000, hookTimeout: 60000 },
      },
    ],
  },
});
