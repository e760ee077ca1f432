import { fileURLToPath } from 'node:url';
import react from '@vitejs/plugin-react';
import { defineConfig } from 'vitest/config';

const commonSource = fileURLToPath(new URL('../common/src/index.ts', import.meta.url));
const commonDir = fileURLToPath(new URL('../common/src/', import.meta.url));

// The front end compiles common/ from source (the same engine code the server runs, built for the browser).
export default defineConfig({
  plugins: [react()],
  // `@ampwright/common/api/...` reaches one module without pulling the whole engine into the bundle.
  resolve: {
    alias: [
      { find: /^@ampwright\/common$/, replacement: commonSource },
      { find: /^@ampwright\/common\/(.*)$/, replacement: `${commonDir}$1` },
    ],
  },
  server: {
    host: '127.0.0.1',
    port: 5173,
    strictPort: true,
    proxy: { '/api': { target: 'http://127.0.0.1:3000', changeOrigin: false } },
  },
  preview: { host: '127.0.0.1' },
  // The sheet page's preview worker (features/sheets/preview) runs the engine as an ES module, split like the page.
  worker: { format: 'es' },
  // Source maps stay in dist/ for debugging; the server does not serve them (backend bootstrap.ts).
  build: {
    outDir: 'dist',
    sourcemap: true,
    rolldownOptions: {
      output: {
        // The sheet page's large libraries in chunks of their own, fetched in parallel and cached apart from our code.
        codeSplitting: {
          groups: [
            { name: 'katex', test: /node_modules[\\/]katex/ },
            { name: 'codemirror', test: /node_modules[\\/](@codemirror|@lezer|crelt|style-mod|w3c-keyname)/ },
            { name: 'markdown', test: /node_modules[\\/](markdown-it|entities|linkify-it|mdurl|uc\.micro|punycode)/ },
          ],
        },
      },
    },
  },
  test: {
    projects: [
      { extends: true, test: { name: 'unit', include: ['src/**/*.spec.{ts,tsx}'], environment: 'jsdom', setupFiles: ['src/test-setup.ts'] } },
      // End-to-end: Debian's Chromium through playwright-core against the built app that scripts/test.mjs starts.
      {
        extends: true,
        test: { name: 'e2e', include: ['e2e/**/*.e2e.ts'], environment: 'node', fileParallelism: false, testTimeout: 60000, hookTimeout: 60000 },
      },
    ],
  },
});
