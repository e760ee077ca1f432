import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: { include: ['src/**/*.spec.ts', 'fuzz/**/*.spec.ts'], environment: 'node' },
});
