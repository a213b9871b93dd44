// @ts-check
import fs from 'node:fs';
import js from '@eslint/js';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import tseslint from 'typescript-eslint';

const features = fs.existsSync('src/features') ? fs.readdirSync('src/features') : [];

/** Imports flow one way: app -> features -> shared (src/lib, src/components, common). */
const layerRules = [
  {
    files: ['src/lib/**', 'src/components/**', 'common/**'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              group: ['@/features/*', '@/app/*', '**/features/**', '**/app/**'],
              message: 'Shared code must not import features or the app.',
            },
          ],
        },
      ],
    },
  },
  ...features.map((feature) => ({
    files: [`src/features/${feature}/**`],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            { group: ['@/app/*', '**/app/**'], message: 'Features must not import the app layer.' },
            {
              group: [
                `@/features/*`,
                `!@/features/${feature}`,
                `!@/features/${feature}/**`,
                '../../*/**',
                `!../../${feature}/**`,
              ],
              message: 'No reaching into another feature: move shared code to src/lib or common/.',
            },
          ],
        },
      ],
    },
  })),
  {
    files: ['common/**'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              group: ['**/server/**', '**/db/**', '@/*'],
              message: 'common/ is shared by client and server: keep it free of either.',
            },
          ],
        },
      ],
    },
  },
];

export default tseslint.config(
  { ignores: ['dist', 'node_modules', 'uploads', '.data', '.test-artifacts', 'fixtures'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.browser, ...globals.node } },
    rules: {
      '@typescript-eslint/no-explicit-any': 'off',
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_' },
      ],
      'no-restricted-syntax': [
        'error',
        { selector: "CallExpression[callee.property.name='only']", message: 'No focused tests.' },
      ],
    },
  },
  {
    files: ['src/**/*.tsx', 'src/**/*.ts'],
    plugins: { 'react-hooks': reactHooks },
    rules: { 'react-hooks/rules-of-hooks': 'error', 'react-hooks/exhaustive-deps': 'warn' },
  },
  ...layerRules,
);
