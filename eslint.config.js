// Flat config: TypeScript everywhere, zero warnings in `npm run lint`.
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import { readdirSync } from 'node:fs';

// A feature does not import another feature: shared data lives in src/lib (e.g. src/lib/queries),
// shared UI in src/components. One block per folder of src/features forbids the others' paths.
const FEATURES = readdirSync(new URL('./src/features', import.meta.url), { withFileTypes: true })
  .filter((entry) => entry.isDirectory())
  .map((entry) => entry.name);
const featureIsolation = FEATURES.map((feature) => {
  const others = FEATURES.filter((other) => other !== feature);
  return {
    files: [`src/features/${feature}/**/*.{ts,tsx}`],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: others.length
            ? [
                {
                  regex: `^(\\.\\./)+(features/)?(${others.join('|')})(/|$)`,
                  message: `src/features/${feature} must not import another feature; move what both need to src/lib or src/components.`,
                },
              ]
            : [],
        },
      ],
    },
  };
});

export default tseslint.config(
  {
    ignores: [
      'dist/**',
      'packages/cli/dist/**',
      'node_modules/**',
      '.legwork/**',
      'test-output/**',
      'drizzle/**',
    ],
  },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    rules: {
      '@typescript-eslint/consistent-type-imports': 'error',
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  {
    files: ['src/**/*.{ts,tsx}'],
    plugins: { 'react-hooks': reactHooks },
    rules: { ...reactHooks.configs.recommended.rules },
  },
  ...featureIsolation,
  {
    // shared/ is a leaf: pure code, no I/O, importable by the browser, the server, the worker and the CLI.
    files: ['shared/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              group: [
                'node:*',
                'fs',
                'path',
                'pg',
                'express',
                'drizzle-orm',
                'drizzle-orm/*',
                'react',
                'react-dom',
              ],
              message: 'shared/ is pure: no I/O or framework imports.',
            },
            {
              group: [
                '../../server/*',
                '../../worker/*',
                '../../src/*',
                '../server/*',
                '../worker/*',
                '../src/*',
              ],
              message: 'shared/ must not import from server, worker or src.',
            },
          ],
        },
      ],
    },
  },
);
