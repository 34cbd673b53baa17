// Lint enforces the import rules of STYLE.md ("The house") rather than review:
// shared/ imports nothing from src/, server/ or tests/; src/ and server/ meet only in shared/;
// no import cycles; on the server only repositories and db/ touch Drizzle's query builder.
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import importX from 'eslint-plugin-import-x';
import { createTypeScriptImportResolver } from 'eslint-import-resolver-typescript';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', '.data/**', 'coverage/**', 'drizzle/**', 'dev-dist/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    plugins: { 'import-x': importX },
    settings: {
      'import-x/resolver-next': [createTypeScriptImportResolver({ project: './tsconfig.json' })],
    },
    languageOptions: { globals: { ...globals.node } },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      'import-x/no-cycle': ['error', { ignoreExternal: true }],
      'import-x/no-restricted-paths': [
        'error',
        {
          zones: [
            { target: './shared', from: './src', message: 'shared/ must not import the client.' },
            { target: './shared', from: './server', message: 'shared/ must not import the server.' },
            { target: './shared', from: './tests', message: 'shared/ must not import tests.' },
            { target: './src', from: './server', message: 'The client and the server meet only in shared/.' },
            { target: './server', from: './src', message: 'The client and the server meet only in shared/.' },
          ],
        },
      ],
    },
  },
  {
    files: ['shared/**/*.ts'],
    ignores: ['shared/**/*.test.ts'],
    languageOptions: { globals: { ...globals['shared-node-browser'] } },
    rules: {
      'no-restricted-imports': [
        'error',
        { patterns: [{ group: ['node:*', 'fs', 'path', 'os', 'crypto', 'child_process'], message: 'shared/ is pure: no Node APIs.' }] },
      ],
      'no-restricted-globals': ['error', 'window', 'document', 'navigator', 'localStorage', 'process', 'Buffer'],
    },
  },
  {
    files: ['src/**/*.{ts,tsx}'],
    plugins: { 'react-hooks': reactHooks },
    languageOptions: { globals: { ...globals.browser } },
    rules: {
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'warn',
    },
  },
  {
    files: ['server/features/**/*.ts'],
    ignores: ['server/features/**/*.repository.ts', 'server/features/auth/password.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        { paths: [{ name: 'drizzle-orm', message: 'Only repositories touch Drizzle (router → service → repository).' }] },
      ],
    },
  },
);
