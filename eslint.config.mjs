// ESLint for the whole repository (flat config): typescript-eslint's recommended rules, React's hook rules
// in the app, and the import rule of the app's features: a feature is used from outside only through its
// public index (frontend/src/features/<name>/index.ts). Formatting is Prettier's (.prettierrc.json).
import { readdirSync } from 'node:fs';
import js from '@eslint/js';
import prettier from 'eslint-config-prettier';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import tseslint from 'typescript-eslint';

const FEATURES = readdirSync(new URL('./frontend/src/features', import.meta.url), { withFileTypes: true })
  .filter((d) => d.isDirectory())
  .map((d) => d.name);

/** Inside feature `own`: another feature only through its index (`../../<other>`), never a file inside it. */
const featureBoundary = (own) => ({
  files: [`frontend/src/features/${own}/**/*.{ts,tsx}`],
  rules: {
    'no-restricted-imports': [
      'error',
      {
        patterns: [
          {
            regex: `^(\\.\\./)+(${FEATURES.filter((f) => f !== own).join('|')})/.+`,
            message: 'Use the other feature through its public index (features/<name>/index.ts), or compose the two in a route.',
          },
        ],
      },
    ],
  },
});

export default tseslint.config(
  { ignores: ['**/dist/**', '**/node_modules/**', '.data/**', '.scratch/**', 'frontend/dev-dist/**', '**/*.d.ts'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node } },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none' }],
      // Control characters are matched on purpose where untrusted text is cleaned or checked.
      'no-control-regex': 'off',
    },
  },
  {
    // Tests read loosely typed JSON answers.
    files: ['**/test/**', '**/e2e/**', '**/*.spec.{ts,tsx}', '**/*.test.ts'],
    rules: { '@typescript-eslint/no-explicit-any': 'off' },
  },
  {
    files: ['**/*.cjs'],
    languageOptions: { sourceType: 'commonjs' },
    rules: { '@typescript-eslint/no-require-imports': 'off' },
  },
  {
    // The browser benchmark runs in Node and hands functions to the page.
    files: ['frontend/bench/**'],
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
  },
  {
    files: ['frontend/**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.browser } },
    plugins: { 'react-hooks': reactHooks },
    rules: { ...reactHooks.configs.recommended.rules },
  },
  ...FEATURES.map(featureBoundary),
  {
    files: ['frontend/src/{routes,app,components,lib}/**/*.{ts,tsx}'],
    rules: {
      'no-restricted-imports': [
        'error',
        { patterns: [{ regex: `features/(${FEATURES.join('|')})/.+`, message: 'Use the feature through its public index (features/<name>/index.ts).' }] },
      ],
    },
  },
  prettier,
);
