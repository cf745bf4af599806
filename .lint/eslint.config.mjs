// Lint for the whole tree: `npm run lint` (also first in .ci/run, with `tsc --noEmit` and `prettier --check`).
// Style is Prettier's (.prettierrc.json); this file holds the rules a formatter cannot check, and the walls
// between the layers (.lint/walls.mjs).
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import walls from './walls.mjs';

export default tseslint.config(
  {
    ignores: [
      'node_modules/',
      '.next*/',
      '.data/',
      '.keys/',
      'tests/.artifacts/',
      'public/',
      'fonts/',
      'next-env.d.ts',
    ],
  },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    files: ['**/*.{ts,tsx,mjs,js}'],
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    plugins: { 'react-hooks': reactHooks, worldsheet: walls },
    linterOptions: { reportUnusedDisableDirectives: 'error' },
    rules: {
      'worldsheet/walls': 'error',
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'error',
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none', ignoreRestSiblings: true },
      ],
      'no-duplicate-imports': ['error', { allowSeparateTypeImports: true }],
      '@typescript-eslint/consistent-type-imports': ['error', { fixStyle: 'inline-type-imports' }],
      eqeqeq: ['error', 'smart'],
    },
  },
  {
    // Kysely's own advice: a migration sees the database as it was, not today's typed schema.
    files: ['migrations/**', 'db/migrate.ts'],
    rules: { '@typescript-eslint/no-explicit-any': 'off' },
  },
);
