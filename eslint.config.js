// Lint configuration (eslint 10 flat config) with typescript-eslint's type-aware rules.
// `npm run lint` runs it; `npm test` (and so CI) runs it after the typecheck. Keep it clean.
// `npm run lint` keeps a cache by file content (node_modules/.cache/eslint/): an unchanged file is not
// linted again, which takes a full type-aware pass (~45 s on a 2-core machine) down to the files touched.
// Type-aware findings can depend on other files (a callee turned async makes an unchanged caller's call a
// floating promise), which the cache does not see: CI lints a fresh clone, so without a cache, and
// `rm -rf node_modules/.cache/eslint` gives the same full pass locally.
import js from '@eslint/js';
import tseslint from 'typescript-eslint';

export default tseslint.config(
  {
    ignores: ['node_modules/**', 'dist/**', 'client/**', 'openapi/**', 'coverage/**', 'src/http/schemas/examples.generated.ts', '**/*.js', '**/*.mjs', '**/*.cjs', 'vitest.config.ts'],
  },
  js.configs.recommended,
  ...tseslint.configs.recommendedTypeChecked,
  {
    languageOptions: {
      parserOptions: {
        projectService: true,
        tsconfigRootDir: import.meta.dirname,
      },
    },
    rules: {
      // The two rules this linter is here for: a promise nobody awaits loses its error.
      '@typescript-eslint/no-floating-promises': 'error',
      '@typescript-eslint/no-misused-promises': 'error',
      // Unused names are the typecheck's job (tsconfig noUnusedLocals/noUnusedParameters; npm test runs it
      // first): the same finding, without a second pass over every file here.
      '@typescript-eslint/no-unused-vars': 'off',
      // Off: fastify route handlers and hooks are async by contract (a returned value is the reply),
      // so an async handler without an await is the normal form, not a mistake.
      '@typescript-eslint/require-await': 'off',
      // Off for now: clean-up of redundant assertions touches the route files other work is changing
      // this round; enable once it has been made clean (it is auto-fixable: eslint --fix).
      '@typescript-eslint/no-unnecessary-type-assertion': 'off',
    },
  },
  {
    // Tests read JSON response bodies as `any` (res.json()) by the hundreds; typing every one of them
    // could not be made clean in time, so the no-unsafe-* family is off in test/ only (on in src/, bench/, scripts/).
    files: ['test/**/*.ts'],
    rules: {
      '@typescript-eslint/no-unsafe-assignment': 'off',
      '@typescript-eslint/no-unsafe-argument': 'off',
      '@typescript-eslint/no-unsafe-member-access': 'off',
      '@typescript-eslint/no-unsafe-call': 'off',
      '@typescript-eslint/no-unsafe-return': 'off',
    },
  },
);
