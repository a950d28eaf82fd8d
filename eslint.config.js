import { readdirSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import js from '@eslint/js';
import { createTypeScriptImportResolver } from 'eslint-import-resolver-typescript';
import importX from 'eslint-plugin-import-x';
import jsxA11y from 'eslint-plugin-jsx-a11y';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import tseslint from 'typescript-eslint';

// Absolute, so the zones hold wherever ESLint runs from (the repo root, a workspace, a test).
const STATION = fileURLToPath(new URL('./station/src', import.meta.url));
const stationFeatures = readdirSync(`${STATION}/features`, {
  withFileTypes: true,
})
  .filter((entry) => entry.isDirectory())
  .map((entry) => entry.name);

/**
 * The station's layers: shared code (components, hooks, lib) never imports a feature, and a
 * feature never imports another feature. `src/app` composes them.
 */
const stationBoundaryZones = [
  ...['components', 'hooks', 'lib'].map((shared) => ({
    target: `${STATION}/${shared}`,
    from: `${STATION}/features`,
    message:
      'Shared code must not import a feature: move the part into shared code or pass it in from src/app.',
  })),
  ...stationFeatures.map((feature) => ({
    target: `${STATION}/features/${feature}`,
    from: `${STATION}/features`,
    except: [`./${feature}`],
    message:
      'Features do not import each other: move the part into shared code or compose in src/app.',
  })),
];

export default tseslint.config(
  { ignores: ['**/dist/**', '**/node_modules/**', 'data/**', 'artifacts/**', 'drizzle/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node } },
    rules: {
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_' },
      ],
      // The hub and simulator use Nest's decorator injection, which needs real class imports.
      '@typescript-eslint/consistent-type-imports': 'off',
    },
  },
  {
    files: ['station/src/**/*.{ts,tsx}', 'hub/src/**/*.ts'],
    plugins: { 'import-x': importX },
    settings: {
      // How import-x reads the TypeScript files an import leads to (no-cycle follows them).
      'import-x/extensions': importX.flatConfigs.typescript.settings['import-x/extensions'],
      'import-x/parsers': importX.flatConfigs.typescript.settings['import-x/parsers'],
      'import-x/resolver-next': [
        createTypeScriptImportResolver({
          project: ['station/tsconfig.json', 'hub/tsconfig.test.json'],
          noWarnOnMultipleProjects: true,
        }),
      ],
    },
    rules: {
      'import-x/no-cycle': ['error', { ignoreExternal: true }],
    },
  },
  {
    files: ['station/src/**/*.{ts,tsx}'],
    rules: {
      'import-x/no-restricted-paths': ['error', { zones: stationBoundaryZones }],
    },
  },
  {
    files: ['station/src/**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.browser } },
    plugins: { 'react-hooks': reactHooks },
    rules: reactHooks.configs.recommended.rules,
  },
  {
    files: ['station/src/**/*.tsx'],
    ...jsxA11y.flatConfigs.recommended,
  },
);
