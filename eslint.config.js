// ESLint for the whole repository (`npm run lint`). Besides typescript-eslint's recommended rules (not
// the type-checked set, which would make a lint run as slow as a type check) and the React hooks rules,
// it enforces the import table of docs/ARCHITECTURE.md §2: keep the two in step.
import { builtinModules } from 'node:module';
import js from '@eslint/js';
import boundaries from 'eslint-plugin-boundaries';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import tseslint from 'typescript-eslint';

/** The parts of docs/ARCHITECTURE.md §1, matched from the repository root; the first match wins. */
const PARTS = [
  { type: 'shared-engine', pattern: 'shared/engine' },
  { type: 'shared-schema', pattern: 'shared/schema' },
  { type: 'shared', pattern: 'shared' },
  { type: 'app', pattern: 'app' },
  { type: 'components', pattern: 'components' },
  { type: 'hooks', pattern: 'hooks' },
  { type: 'constants', pattern: 'constants' },
  { type: 'server', pattern: 'server' },
  { type: 'scripts', pattern: 'scripts' },
  { type: 'tests', pattern: 'tests' },
].map((part) => ({ ...part, partialMatch: false }));

const part = (...types) => ({ to: { element: { types: { anyOf: types } } } });
const SHARED = ['shared-engine', 'shared-schema', 'shared'];

/** docs/ARCHITECTURE.md §2, row by row: what each part may import; everything else is refused. */
const MAY_IMPORT = [
  { from: 'app', allow: ['app', 'components', 'hooks', 'constants', ...SHARED] },
  { from: 'components', allow: ['components', 'hooks', 'constants', ...SHARED] },
  { from: 'hooks', allow: ['hooks', ...SHARED] },
  { from: 'constants', allow: ['constants', ...SHARED] },
  { from: 'shared-engine', allow: ['shared-engine', 'shared-schema'], files: ['units'] },
  { from: 'shared-schema', allow: ['shared-schema'], files: ['units'] },
  { from: 'shared', allow: SHARED },
  { from: 'server', allow: ['server', ...SHARED] },
  { from: 'scripts', allow: ['scripts', 'server', 'tests', ...SHARED] },
  { from: 'tests', allow: ['app', 'components', 'hooks', 'constants', 'server', 'scripts', 'tests', ...SHARED] },
];

const policies = MAY_IMPORT.flatMap(({ from, allow, files = [] }) => [
  { from: { element: { type: from } }, allow: part(...allow) },
  ...files.map((category) => ({ from: { element: { type: from } }, allow: { to: { file: { categories: category } } } })),
]);

const NODE_AND_SERVER = ['node:*', 'express', 'knex', 'better-sqlite3', 'multer', 'nodemailer', 'pdfmake', 'pdfmake/*', 'pino'];
const APP_FRAMEWORKS = ['react', 'react-*', 'react/*', 'react-native', 'react-native-*', 'expo', 'expo-*', '@expo/*', '@tanstack/*'];
/** Bare built-in names ('fs', 'path') are matched exactly: as patterns, 'constants' would match every `../constants/…`. */
const restrictPackages = (group, message, { builtins = false } = {}) => ({
  'no-restricted-imports': ['error', { paths: builtins ? builtinModules.map((name) => ({ name, message })) : [], patterns: [{ group, message }] }],
});

export default tseslint.config(
  {
    ignores: ['node_modules/', 'dist/', 'data/', 'coverage/', '.expo/', 'web-build/', 'tests/.tmp/', 'tests/e2e/screenshots/', 'expo-env.d.ts'],
  },
  js.configs.recommended,
  tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node } },
    rules: {
      // Metro bundles assets (the app's fonts) through require(); code imports with import.
      '@typescript-eslint/no-require-imports': ['error', { allow: ['\\.ttf$'] }],
      // A leading underscore marks a parameter a signature needs (Express's error handler) or a member left out of a rest.
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrorsIgnorePattern: '^_' }],
    },
  },
  {
    files: ['app/**', 'components/**', 'hooks/**', 'constants/**'],
    languageOptions: { globals: { ...globals.browser } },
    plugins: { 'react-hooks': reactHooks },
    rules: {
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'error',
      ...restrictPackages(
        NODE_AND_SERVER,
        'The app runs in the browser and on phones: no Node built-ins or server packages (docs/ARCHITECTURE.md §2).',
        {
          builtins: true,
        },
      ),
    },
  },
  {
    files: ['shared/**'],
    rules: restrictPackages(
      [...NODE_AND_SERVER, ...APP_FRAMEWORKS],
      'shared/ runs in the app and on the server: no Node built-ins, server or app frameworks (docs/ARCHITECTURE.md §2).',
      { builtins: true },
    ),
  },
  {
    files: ['server/**'],
    rules: restrictPackages(APP_FRAMEWORKS, 'The server does not import the app’s frameworks (docs/ARCHITECTURE.md §2).'),
  },
  {
    files: ['app/**', 'components/**', 'hooks/**', 'constants/**', 'shared/**', 'server/**', 'scripts/**', 'tests/**'],
    plugins: { boundaries },
    settings: {
      'boundaries/elements': PARTS,
      'boundaries/files': [{ category: 'units', pattern: 'shared/units.ts' }],
      'import/resolver': { node: { extensions: ['.ts', '.tsx', '.mjs', '.js'] } },
    },
    rules: {
      'boundaries/dependencies': ['error', { default: 'disallow', policies }],
    },
  },
);
