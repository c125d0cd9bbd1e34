// The layering of ARCHITECTURE.md as a rule: a folder says where its code may run.
import tseslint from 'typescript-eslint';

const nodeModules = ['node:*', 'fs', 'path', 'os', 'child_process', 'crypto', 'url', 'net', 'http', 'stream', 'zlib', 'events', 'util', 'worker_threads'];
const nativeAndShell = ['electron', 'serialport', '@serialport/*', 'better-sqlite3'];

function forbid(patterns, message) {
  return ['error', { patterns: [{ group: patterns, message }] }];
}

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', 'release/**', 'test-output/**'] },
  {
    files: ['**/*.ts', '**/*.mjs', '**/*.js'],
    languageOptions: { parser: tseslint.parser, ecmaVersion: 2022, sourceType: 'module' },
    plugins: { '@typescript-eslint': tseslint.plugin },
    rules: {
      'no-debugger': 'error',
      'no-var': 'error',
      'prefer-const': 'error',
      eqeqeq: ['error', 'always', { null: 'ignore' }],
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  {
    files: ['app/**/*.ts'],
    rules: {
      'no-restricted-imports': forbid(
        [...nodeModules, ...nativeAndShell, 'chart.js', 'chart.js/*', '**/main/**', '**/renderer/**', '../main/*', '../renderer/*'],
        'app/ is the pure core: it may import app/ and small pure libraries only (ARCHITECTURE.md).',
      ),
    },
  },
  {
    files: ['main/**/*.ts'],
    ignores: ['main/electron/**'],
    rules: {
      'no-restricted-imports': forbid(['electron', '**/renderer/**', 'chart.js', 'chart.js/*'], 'main/ outside main/electron/ never imports electron or renderer code (ARCHITECTURE.md).'),
    },
  },
  {
    // The logbook is reached through its interface only (main/store/logbookTypes.ts), so a store can be SQLite or
    // PostgreSQL without its callers knowing: no database driver or store internals outside main/store.
    files: ['main/**/*.ts'],
    ignores: ['main/electron/**', 'main/store/**'],
    rules: {
      'no-restricted-imports': forbid(
        ['electron', '**/renderer/**', 'chart.js', 'chart.js/*', 'better-sqlite3', 'pg', 'pg-*', '**/store/openDatabase', '**/store/exchangeRows', '**/store/recordQueries', '**/store/sqliteLogbook', '**/store/postgres/*'],
        'main/ outside main/store reaches the logbook through the Logbook interface (main/store/index.ts), never a database driver or a store\'s internals; and it never imports electron or renderer code (ARCHITECTURE.md).',
      ),
    },
  },
  {
    files: ['main/electron/**/*.ts'],
    rules: {
      'no-restricted-imports': forbid(['**/renderer/**', 'chart.js', 'chart.js/*'], 'main/electron/ never imports renderer code (ARCHITECTURE.md).'),
    },
  },
  {
    files: ['renderer/**/*.ts'],
    rules: {
      'no-restricted-imports': forbid([...nodeModules, ...nativeAndShell, '**/main/**', '../main/*'], 'renderer/ talks to the core only through the bench API contract: no Node, Electron or main/ (ARCHITECTURE.md).'),
    },
  },
);
