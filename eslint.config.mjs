// ESLint (flat config): typescript-eslint's recommended rules for every TypeScript file,
// angular-eslint's for the client's components and templates (with its accessibility rules),
// and eslint-config-prettier last so that formatting is Prettier's alone (`npm run format`).
// `npm test` runs `eslint .`: an error fails the run.
import js from '@eslint/js';
import angular from 'angular-eslint';
import prettier from 'eslint-config-prettier';
import globals from 'globals';
import tseslint from 'typescript-eslint';

export default tseslint.config(
  {
    ignores: ['dist/**', 'node_modules/**', '.data/**', '.angular/**', 'coverage/**', 'client/public/**'],
  },
  {
    files: ['**/*.ts', '**/*.mjs', '**/*.cjs', '**/*.js'],
    extends: [js.configs.recommended, ...tseslint.configs.recommended],
    languageOptions: { globals: { ...globals.node } },
    rules: {
      // Unused names are errors, except the `_name` convention for a deliberately unused one.
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_', destructuredArrayIgnorePattern: '^_', caughtErrors: 'none' },
      ],
    },
  },
  {
    files: ['**/*.cjs', 'jest.config.js'],
    rules: { '@typescript-eslint/no-require-imports': 'off' },
  },
  {
    files: ['client/src/**/*.ts'],
    extends: [...angular.configs.tsRecommended],
    languageOptions: { globals: { ...globals.browser } },
    processor: angular.processInlineTemplates,
    rules: {
      '@angular-eslint/directive-selector': ['error', { type: 'attribute', prefix: 'app', style: 'camelCase' }],
      '@angular-eslint/component-selector': ['error', { type: 'element', prefix: 'app', style: 'kebab-case' }],
    },
  },
  {
    files: ['client/src/**/*.html'],
    extends: [...angular.configs.templateRecommended, ...angular.configs.templateAccessibility],
  },
  prettier,
);
