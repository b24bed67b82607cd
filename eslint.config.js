import js from '@eslint/js'
import prettier from 'eslint-config-prettier'
import { defineConfig } from 'eslint/config'
import vue from 'eslint-plugin-vue'
import tseslint from 'typescript-eslint'

// Node globals for the few plain .js files (configs); TypeScript checks names in .ts/.vue.
const nodeGlobals = Object.fromEntries(
  ['process', 'console', 'URL', 'setTimeout', 'clearTimeout', 'Buffer'].map((name) => [
    name,
    'readonly',
  ]),
)

export default defineConfig(
  {
    ignores: [
      'dist/',
      'node_modules/',
      '.data/',
      'test-results/',
      'coverage/',
      '**/components.d.ts',
      '**/auto-imports.d.ts',
    ],
  },
  js.configs.recommended,
  tseslint.configs.recommended,
  vue.configs['flat/recommended'],
  {
    files: ['**/*.vue'],
    languageOptions: {
      parserOptions: {
        parser: tseslint.parser,
        extraFileExtensions: ['.vue'],
        sourceType: 'module',
      },
    },
  },
  {
    files: ['**/*.{ts,mts,cts,vue}'],
    rules: { 'no-undef': 'off' },
  },
  {
    files: ['**/*.{js,mjs,cjs}'],
    languageOptions: { globals: nodeGlobals },
  },
  {
    rules: {
      // `_name` marks a deliberately unused argument (e.g. Express's four-argument error handler).
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_' },
      ],
    },
  },
  {
    // PDF renderers draw the data they are given and never load it: the documents service
    // (server/services/documents/) reads the database and passes the data in.
    files: ['server/documents/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          paths: ['sequelize'],
          patterns: [
            {
              regex: '^\\.\\.?/(\\.\\./)*(services|models|db)(/|$)',
              message: 'load the data in server/services/documents/ and pass it in',
            },
          ],
        },
      ],
    },
  },
  {
    // One way to the database: plain statements and transactions go through server/db/sql.ts
    // (select, execute, withTransaction), which alone calls Sequelize's query and transaction.
    files: ['server/**/*.ts', 'scripts/**/*.ts'],
    ignores: ['server/db/**'],
    rules: {
      'no-restricted-syntax': [
        'error',
        {
          selector:
            "CallExpression[callee.property.name=/^(query|transaction)$/][callee.object.type='CallExpression'][callee.object.callee.name='db']",
          message: 'use select, execute or withTransaction from server/db/sql.ts',
        },
      ],
    },
  },
  prettier,
)
