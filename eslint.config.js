// ESLint: typescript-eslint's recommended rules, the React hooks rules, and the import
// boundaries of the codebase (DEVELOPERS.md, "Rules, condensed"): the pure domain imports no
// web, database, queue, Node or environment; background jobs import no pages or React.
import js from '@eslint/js'
import reactHooks from 'eslint-plugin-react-hooks'
import tseslint from 'typescript-eslint'

const DOMAIN_FORBIDDEN = {
  paths: [
    { name: 'react', message: 'app/domain is pure: no React (DEVELOPERS.md).' },
    { name: 'react-dom', message: 'app/domain is pure: no React.' },
    { name: 'react-router', message: 'app/domain is pure: no React Router.' },
    { name: 'drizzle-orm', message: 'app/domain is pure: no database.' },
    { name: 'pg', message: 'app/domain is pure: no database.' },
    { name: 'pg-boss', message: 'app/domain is pure: no queue.' },
    { name: 'zod', message: 'app/domain is pure: parsing with zod happens at the edges (app/lib, app/server).' },
  ],
  patterns: [
    {
      group: ['react/*', 'react-dom/*', 'react-router/*', 'drizzle-orm/*', '@react-router/*'],
      message: 'app/domain is pure: no web or database packages.',
    },
    { group: ['node:*'], message: 'app/domain is pure: no Node built-ins.' },
    // (a regex: in the gitignore-style groups a leading # starts a comment)
    {
      regex: '^#(app/(server|routes|components|lib)|jobs|seed|scripts|tests)/',
      message: 'app/domain imports only app/domain.',
    },
  ],
}

export default tseslint.config(
  { ignores: ['build/', '.react-router/', 'node_modules/', '.data/', 'coverage/', 'tests/.artifacts/', 'public/'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    files: ['app/**/*.{ts,tsx}'],
    plugins: { 'react-hooks': reactHooks },
    rules: {
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'error',
    },
  },
  {
    files: ['**/*.{ts,tsx}'],
    rules: {
      // The app refuses control characters in what people type, on purpose: its patterns name them.
      'no-control-regex': 'off',
      // Unused names are mistakes; a leading underscore marks one left on purpose.
      '@typescript-eslint/no-unused-vars': [
        'error',
        {
          argsIgnorePattern: '^_',
          varsIgnorePattern: '^_',
          caughtErrorsIgnorePattern: '^_',
          destructuredArrayIgnorePattern: '^_',
        },
      ],
      '@typescript-eslint/consistent-type-imports': [
        'error',
        { fixStyle: 'inline-type-imports', disallowTypeAnnotations: false },
      ],
      // Code is reached through the #app/*, #tests/* … map; only documents (docs/) by a path.
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              regex: '^(\\.\\./){2,}(?!(\\.\\./)*docs/)',
              message: 'Import through the #app/*, #tests/* … map instead of ../../.',
            },
          ],
        },
      ],
    },
  },
  {
    files: ['app/domain/**/*.{ts,tsx}'],
    ignores: ['app/domain/**/*.test.ts'],
    rules: {
      'no-restricted-imports': ['error', DOMAIN_FORBIDDEN],
      'no-restricted-globals': [
        'error',
        { name: 'process', message: 'app/domain is pure: no environment (pass values in).' },
      ],
      'no-restricted-syntax': [
        'error',
        { selector: 'ImportExpression', message: 'app/domain is pure: no dynamic imports.' },
      ],
    },
  },
  {
    files: ['jobs/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          paths: [
            { name: 'react', message: 'Background jobs render no pages.' },
            { name: 'react-router', message: 'Background jobs are not routes.' },
          ],
          patterns: [
            {
              regex: '^#app/(routes|components)/',
              message: 'Background jobs use app/server and app/domain, never pages or components.',
            },
          ],
        },
      ],
    },
  },
  {
    // No type assertions in production code (app/, jobs/): values from outside (JSON, forms, stored rows,
    // library types) are narrowed by guards (app/lib/guards.ts, thermo/json.ts) or parsed with
    // zod. The few left say why on an eslint-disable line; `npm run count:casts` lists them.
    files: ['app/**/*.{ts,tsx}', 'jobs/**/*.ts'],
    ignores: ['**/*.test.{ts,tsx}'],
    rules: { '@typescript-eslint/consistent-type-assertions': ['error', { assertionStyle: 'never' }] },
  },
  {
    // Tests build malformed documents on purpose (a definition with a wrong field, JSON as it arrives).
    files: ['**/*.test.{ts,tsx}', 'tests/**/*.ts'],
    rules: { '@typescript-eslint/no-explicit-any': 'off' },
  },
  {
    files: ['**/*.js', '**/*.mjs'],
    languageOptions: { globals: { process: 'readonly', console: 'readonly', URL: 'readonly' } },
  },
)
