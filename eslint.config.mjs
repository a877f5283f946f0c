// Lint for every workspace. The one architectural rule enforced here: a frontend feature never
// imports another feature (pages in app/routes compose features; shared code lives in
// components/, lib/, config/). Zones are built from the folders that exist, so a new feature is
// covered without editing this file.
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import importX from 'eslint-plugin-import-x';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';

const root = path.dirname(fileURLToPath(import.meta.url));
const featuresDir = path.join(root, 'frontend/src/features');
const features = fs.existsSync(featuresDir)
  ? fs.readdirSync(featuresDir, { withFileTypes: true }).filter((d) => d.isDirectory()).map((d) => d.name)
  : [];

const featureZones = features.map((feature) => ({
  target: path.join(featuresDir, feature),
  from: featuresDir,
  except: [`./${feature}`],
  message: 'A feature must not import another feature; compose them in app/routes or move shared code to components/ or lib/.',
}));

export default tseslint.config(
  {
    ignores: ['**/node_modules/**', '**/dist/**', 'storage/**', 'test-results/**', '**/coverage/**'],
  },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: {
      ecmaVersion: 2022,
      sourceType: 'module',
      globals: { ...globals.node },
    },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      'no-eval': 'error',
      'no-implied-eval': 'error',
      'no-new-func': 'error',
    },
  },
  {
    files: ['frontend/src/**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.browser } },
    plugins: { 'import-x': importX, 'react-hooks': reactHooks },
    settings: {
      // Resolve '@/…' aliases and extension-less TypeScript imports, so the zones below see
      // every import; an unresolved import would be silently skipped by no-restricted-paths.
      'import-x/resolver': { typescript: { project: path.join(root, 'frontend/tsconfig.json') } },
    },
    rules: {
      'import-x/no-restricted-paths': ['error', { zones: featureZones }],
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'warn',
    },
  },
  {
    // common/ is pure: no I/O, no Node or DOM APIs.
    files: ['common/src/**/*.ts'],
    ignores: ['common/src/**/*.spec.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            { group: ['node:*', 'fs', 'path', 'http', 'https', 'net', 'child_process', 'os'], message: 'common/ holds pure computation only: no I/O.' },
            { group: ['react', 'react-dom', '@nestjs/*', 'typeorm', 'pg'], message: 'common/ must not depend on a framework.' },
          ],
        },
      ],
    },
  },
);
