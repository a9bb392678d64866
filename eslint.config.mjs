// Flat ESLint config for every workspace; Prettier owns formatting.
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import prettier from 'eslint-config-prettier';
import globals from 'globals';

export default tseslint.config(
  { ignores: ['**/node_modules/**', '**/dist/**', 'var/**', 'golden-outputs/**', 'test-output/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  prettier,
  {
    languageOptions: { globals: { ...globals.node } },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  {
    // The engine is pure TypeScript shared by server and browser: no Node or DOM APIs, no `any`.
    files: ['shared/src/**/*.ts'],
    ignores: ['shared/src/cli/**'],
    languageOptions: { globals: {} },
    rules: {
      '@typescript-eslint/no-explicit-any': 'error',
      'no-restricted-imports': ['error', { patterns: ['node:*', 'fs', 'path', 'zlib', 'crypto', 'os', 'child_process'] }],
    },
  },
  {
    files: ['ui/src/**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.browser } },
  },
);
