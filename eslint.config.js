// ESLint (flat config): typescript-eslint for TypeScript, React rules for islands, the Astro plugin
// for .astro pages, and import boundaries that keep the layers of DEVELOPERS.md one way:
//   pages → lib/server → lib/domain;  islands → lib/client → lib/schemas and lib/domain.
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import react from 'eslint-plugin-react';
import reactHooks from 'eslint-plugin-react-hooks';
import astro from 'eslint-plugin-astro';
import globals from 'globals';

/** Import patterns forbidden in a layer (regular expressions on the import path), with the reason shown. */
const segment = (...names) => `(^|/)(${names.join('|')})(/|$)`;
const server = {
  regex: `${segment('server')}|^(knex|pg|lucia|nodemailer|@node-rs/.*|node:.*)$`,
  message: 'Islands and lib/client run in the browser: they never import lib/server, the database or Node modules.',
};
const framework = {
  regex: '^(astro|astro:.*|react|react-dom(/.*)?|react-map-gl(/.*)?|maplibre-gl|knex|pg|zod)$',
  message: 'lib/domain is pure TypeScript: no Astro, React, map library, Knex or zod.',
};
const outwards = {
  regex: `${segment('server', 'client', 'schemas', 'components', 'pages')}|^node:`,
  message: 'lib/domain imports only lib/domain (and pure packages): no server, client, schemas, components, pages or I/O.',
};

export default tseslint.config(
  {
    ignores: ['dist/', 'dist-*/', 'node_modules/', '.data/', '.astro/', 'coverage/', 'test-results/', 'public/'],
  },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node } },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none' }],
      '@typescript-eslint/consistent-type-imports': ['error', { fixStyle: 'inline-type-imports', disallowTypeAnnotations: false }],
      'no-restricted-syntax': [
        'error',
        { selector: "CallExpression[callee.property.name='only'][callee.object.name=/^(it|describe|test)$/]", message: 'No focused tests.' },
        { selector: "CallExpression[callee.property.name='skip'][callee.object.name=/^(it|describe|test)$/]", message: 'No skipped tests.' },
      ],
    },
  },
  {
    files: ['**/*.d.ts'],
    rules: { '@typescript-eslint/triple-slash-reference': 'off' },
  },
  {
    files: ['src/components/**/*.{ts,tsx}', 'src/lib/client/**/*.ts'],
    plugins: { react, 'react-hooks': reactHooks },
    languageOptions: { globals: { ...globals.browser } },
    settings: { react: { version: 'detect' } },
    rules: {
      ...react.configs.flat.recommended.rules,
      ...react.configs.flat['jsx-runtime'].rules,
      'react/prop-types': 'off',
      // Apostrophes and quotes are ordinary text in JSX; a stray > or } is the mistake worth catching.
      'react/no-unescaped-entities': ['error', { forbid: ['>', '}'] }],
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'error',
    },
  },
  ...astro.configs['flat/recommended'],
  {
    files: ['src/lib/domain/**/*.ts'],
    rules: { 'no-restricted-imports': ['error', { patterns: [framework, outwards] }] },
  },
  {
    files: ['src/components/**/*.{ts,tsx}', 'src/lib/client/**/*.ts'],
    rules: { 'no-restricted-imports': ['error', { patterns: [server] }] },
  },
);
