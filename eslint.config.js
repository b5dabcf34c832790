// https://docs.expo.dev/guides/using-eslint/
const { defineConfig } = require('eslint/config');
const expoConfig = require('eslint-config-expo/flat');

module.exports = defineConfig([
  expoConfig,
  {
    ignores: ['dist/**', 'build/**', 'node_modules/**', '.pgdata/**', 'test-artifacts/**', 'db/migrations/**', '.expo/**', 'tmp_*', 'expo-env.d.ts'],
  },
  {
    rules: {
      'import/no-unresolved': 'off',
      // fast-check's documented style is `fc.property(...)` on the default export.
      'import/no-named-as-default-member': 'off',
    },
  },
]);
