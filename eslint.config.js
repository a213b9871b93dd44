// @ts-check
import fs from 'node:fs';
import path from 'node:path';
import js from '@eslint/js';
import { createNodeResolver, importX } from 'eslint-plugin-import-x';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import tseslint from 'typescript-eslint';

const root = path.dirname(new URL(import.meta.url).pathname);
const folders = (dir) =>
  fs.existsSync(path.join(root, dir))
    ? fs
        .readdirSync(path.join(root, dir), { withFileTypes: true })
        .filter((d) => d.isDirectory())
        .map((d) => d.name)
    : [];
const features = folders('src/features');
const serverFeatures = folders('server');

/**
 * The browser's code never reaches the server's or the database's. (react-dom/server is React's
 * HTML renderer, a package: the published sheet's server drawing uses it.)
 */
const clientOnly = {
  group: ['**/server/**', '**/db/**', '**/server', '**/db', '!react-dom/server'],
  message: 'src/ runs in the browser: share code through common/, never server/ or db/.',
};

/**
 * Imports flow one way: app -> features -> shared (src/lib, src/components, common); src/
 * never imports server/ or db/; common/ imports none of src/, server/, db/; a server feature
 * reaches another feature through its service, never its repository.
 * (A file matched by several blocks takes the last block's list, so each list is complete.)
 */
const layerRules = [
  {
    files: ['src/**'],
    rules: { 'no-restricted-imports': ['error', { patterns: [clientOnly] }] },
  },
  {
    files: ['src/lib/**', 'src/components/**'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            clientOnly,
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
            clientOnly,
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
              group: ['**/server/**', '**/db/**', '**/src/**', '**/server', '**/db', '@/*'],
              message: 'common/ is shared by client and server: keep it free of either.',
            },
          ],
        },
      ],
    },
  },
  ...serverFeatures.map((feature) => ({
    files: [`server/${feature}/**`],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              group: ['../*/*-repository', '../../*/*-repository', `!../${feature}/*`],
              message: `Another feature's repository is its own: call its service instead.`,
            },
            { group: ['**/src/**', '@/*'], message: 'The server never imports the client.' },
          ],
        },
      ],
    },
  })),
];

/** No import cycles anywhere (aliases and .js-suffixed TypeScript imports resolved). */
const cycleRules = {
  files: ['**/*.ts', '**/*.tsx'],
  plugins: { 'import-x': importX },
  settings: {
    'import-x/extensions': ['.ts', '.tsx', '.js', '.mjs'],
    'import-x/parsers': { '@typescript-eslint/parser': ['.ts', '.tsx'] },
    'import-x/resolver-next': [
      createNodeResolver({
        extensions: ['.ts', '.tsx', '.js', '.mjs', '.json'],
        extensionAlias: { '.js': ['.ts', '.tsx', '.js'] },
        alias: { '@': [path.join(root, 'src')], '@common': [path.join(root, 'common')] },
      }),
    ],
  },
  rules: { 'import-x/no-cycle': ['error', { ignoreExternal: true }] },
};

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
  cycleRules,
);
