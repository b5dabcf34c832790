// https://docs.expo.dev/guides/using-eslint/
const { defineConfig } = require('eslint/config');
const expoConfig = require('eslint-config-expo/flat');

/**
 * Layer boundaries (see DEVELOPERS.md): the engine and the figures layer are pure; components
 * do not fetch; the server takes nothing from the client; the client takes only types from the
 * server. tests/unit/lint-boundaries.test.ts lints deliberately wrong fixtures against these.
 */
const NODE_IO = ['node:*', 'fs', 'fs/*', 'path', 'os', 'child_process', 'http', 'https', 'net', 'stream', 'worker_threads', 'crypto', 'zlib'];
const SERVER_SIDE = ['express', 'express-*', 'drizzle-orm', 'drizzle-orm/*', 'drizzle-zod', 'pg', 'pg-boss', 'pdfkit', 'nodemailer', 'multer', 'passport', 'passport-*'];
const CLIENT_SIDE = ['react', 'react/*', 'react-dom', 'react-dom/*', 'react-native', 'react-native-*', 'expo', 'expo-*', '@tanstack/*'];
const PURE = {
  'no-restricted-imports': [
    'error',
    {
      patterns: [
        { group: NODE_IO, message: 'simulation/ and figures/ do no I/O: take numbers in, give numbers (or words) out.' },
        { group: [...SERVER_SIDE, ...CLIENT_SIDE], message: 'simulation/ and figures/ are pure: no Express, database, PDF or React imports.' },
        { group: ['**/db/*', '@/db/*', '**/hooks/*', '@/hooks/*', '**/components/*', '@/components/*', '../app/*', '@/app/*'], message: 'simulation/ and figures/ import no database, hooks, components or screens.' },
      ],
    },
  ],
};
const HEX = /^#(?:[0-9a-fA-F]{3,4}|[0-9a-fA-F]{6}|[0-9a-fA-F]{8})$/;

module.exports = defineConfig([
  expoConfig,
  {
    ignores: ['dist/**', 'build/**', 'node_modules/**', '.pgdata/**', 'test-artifacts/**', 'db/migrations/**', '.expo/**', 'tmp_*', 'expo-env.d.ts', 'tests/fixtures/lint/**'],
  },
  {
    rules: {
      'import/no-unresolved': 'off',
      // fast-check's documented style is `fc.property(...)` on the default export.
      'import/no-named-as-default-member': 'off',
      // One palette: colours are named in constants/theme.ts and nowhere else.
      'no-restricted-syntax': ['error', { selector: `Literal[value=${HEX}]`, message: 'Colours live in constants/theme.ts: import them from there.' }],
    },
  },
  { files: ['constants/theme.ts'], rules: { 'no-restricted-syntax': 'off' } },
  { files: ['simulation/**/*.ts', 'figures/**/*.ts'], rules: PURE },
  {
    // figures/ may name the server's stored-result types (erased at build time).
    files: ['figures/**/*.ts'],
    rules: {
      'no-restricted-imports': 'off',
      '@typescript-eslint/no-restricted-imports': [
        'error',
        {
          patterns: [
            ...PURE['no-restricted-imports'][1].patterns,
            { group: ['../server/*', '**/server/*', '@/server/*'], allowTypeImports: true, message: 'figures/ takes only types from the server.' },
          ],
        },
      ],
    },
  },
  {
    files: ['components/**/*.{ts,tsx}'],
    rules: {
      '@typescript-eslint/no-restricted-imports': [
        'error',
        {
          patterns: [
            { group: ['@/hooks/*', '../hooks/*', '**/hooks/*'], allowTypeImports: true, message: 'Components do not fetch: a screen calls the hook and passes the data in.' },
            { group: ['@/server/*', '**/server/*', '@/db/*', '**/db/*'], allowTypeImports: true, message: 'Client code takes only types from the server and the database schema.' },
          ],
        },
      ],
    },
  },
  {
    files: ['app/**/*.{ts,tsx}', 'hooks/**/*.{ts,tsx}'],
    rules: {
      '@typescript-eslint/no-restricted-imports': [
        'error',
        { patterns: [{ group: ['@/server/*', '**/server/*', '@/db/*', '**/db/*'], allowTypeImports: true, message: 'Client code takes only types from the server and the database schema (import type).' }] },
      ],
    },
  },
  {
    // The database layer (schema, migrations, seed) sits below the server: it may name the server's
    // stored shapes as types, nothing more.
    files: ['db/**/*.ts'],
    rules: {
      '@typescript-eslint/no-restricted-imports': [
        'error',
        { patterns: [{ group: ['../server/*', '**/server/*', '@/server/*'], allowTypeImports: true, message: 'db/ takes only types from the server.' }] },
      ],
    },
  },
  {
    files: ['server/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        { patterns: [{ group: ['@/app/*', '../../app/*', '../../../app/*', '**/components/*', '@/components/*', '**/hooks/*', '@/hooks/*'], message: 'The server takes nothing from the app, its components or its hooks.' }] },
      ],
    },
  },
]);
