// ESLint: the TypeScript rules we hold to, and the layer table of DEVELOPERS.md as import rules —
// each folder may import only the layers below it. `npm test` runs it (npm run lint).
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import globals from 'globals';

/** `no-restricted-imports` patterns that forbid importing the named folders of src/. */
const forbid = (...folders) => ({
  'no-restricted-imports': [
    'error',
    {
      patterns: folders.map((f) => ({
        group: [`**/${f}`, `**/${f}/**`, `../${f}`, `../${f}/**`, `../../${f}`, `../../${f}/**`, `./${f}`, `./${f}/**`],
        message: `this layer may not import src/${f} (see the layer table in DEVELOPERS.md)`,
      })),
    },
  ],
});

export default tseslint.config(
  { ignores: ['dist/**', 'out/**', 'node_modules/**', 'coverage/**', '.certs/**', 'test/fixtures/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { ecmaVersion: 2022, sourceType: 'module' },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none' }],
      'no-console': 'off',
      // Coefficient tables of published algorithms (AS 241, Hart 5666, …) are quoted with all their
      // digits, more than a double keeps; that is deliberate.
      'no-loss-of-precision': 'off',
    },
  },
  // The layers. The engine imports nothing of ours outside itself; the registry only the engine;
  // charts only the engine; the Excel adapter only the registry; the pane and the command line
  // the engine, the registry and charts, and never each other or the adapter.
  { files: ['src/engine/**/*.ts'], rules: forbid('registry', 'functions', 'taskpane', 'cli', 'charts', 'commands') },
  { files: ['src/registry/**/*.ts'], rules: forbid('functions', 'taskpane', 'cli', 'charts', 'commands') },
  { files: ['src/charts/**/*.ts'], rules: forbid('registry', 'functions', 'taskpane', 'cli', 'commands') },
  { files: ['src/functions/**/*.ts'], rules: forbid('taskpane', 'cli', 'charts', 'commands') },
  { files: ['src/taskpane/**/*.ts'], rules: forbid('functions', 'cli', 'commands') },
  { files: ['src/cli/**/*.ts'], rules: forbid('functions', 'taskpane', 'commands') },
  // The pane's parts stay small: a view is its state, a pure render and handlers, none long.
  { files: ['src/taskpane/**/*.ts'], rules: { 'max-lines-per-function': ['error', { max: 80, skipBlankLines: true, skipComments: true }] } },
  {
    // The worksheet wrappers' and tests' `any` is Excel's own interface; elsewhere it is an error.
    files: ['test/**/*.ts'],
    rules: { '@typescript-eslint/no-explicit-any': 'off', '@typescript-eslint/no-require-imports': 'off', '@typescript-eslint/no-non-null-assertion': 'off' },
  },
  {
    files: ['**/*.js', '**/*.cjs'],
    languageOptions: { sourceType: 'commonjs', globals: { ...globals.node } },
    rules: { '@typescript-eslint/no-require-imports': 'off' },
  },
  { files: ['test/browser/fake-host.js', 'test/browser/fixtures/**/*.js'], languageOptions: { globals: { ...globals.browser } } },
);
