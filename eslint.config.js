import js from '@eslint/js';
import globals from 'globals';
import reactHooks from 'eslint-plugin-react-hooks';
import tseslint from 'typescript-eslint';
import { featureBoundaries } from './tools/eslint/feature-boundaries.js';

export default tseslint.config(
  { ignores: ['**/dist/**', '**/dist-server/**', '**/node_modules/**', 'data/**', 'test-results/**', 'coverage/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node } },
    rules: {
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_', destructuredArrayIgnorePattern: '^_' },
      ],
      '@typescript-eslint/consistent-type-imports': ['error', { fixStyle: 'inline-type-imports' }],
      'no-console': 'off',
    },
  },
  {
    files: ['apps/web/**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.browser } },
    plugins: { 'react-hooks': reactHooks, underfoot: { rules: { 'feature-boundaries': featureBoundaries } } },
    rules: {
      ...reactHooks.configs.recommended.rules,
      'underfoot/feature-boundaries': 'error',
    },
  },
  {
    // The trade core runs in the browser and the server alike: no framework, no database, no Node APIs.
    files: ['packages/core/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              group: [
                'express',
                'express-*',
                'knex',
                'better-sqlite3',
                'pg',
                'react',
                'react-*',
                '@tanstack/*',
                'passport*',
                'multer',
                'sharp',
                'nodemailer',
                'pdfkit',
                'node:*',
                'fs',
                'path',
                'crypto',
                '@underfoot/server',
                '@underfoot/web',
                '@underfoot/fakes',
              ],
              message: 'packages/core is pure TypeScript: no frameworks, databases or Node APIs.',
            },
          ],
        },
      ],
    },
  },
);
