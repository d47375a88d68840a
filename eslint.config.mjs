import next from 'eslint-config-next';

// Where things live (DEVELOPERS.md): pages and components read data through a getX(actor) service in lib/<area>/ or moderation/.
const DATABASE = {
  group: ['@/db', '@/db/*', '**/db/models', '**/db/models/*', '**/db/connection'],
  message: 'Nothing under app/ or components/ touches the database: call a getX(actor) service in lib/<area>/ or moderation/ (DEVELOPERS.md, Where things live).',
};

export default [
  { ignores: ['.next*/**', 'node_modules/**', '.data/**', 'next-env.d.ts'] },
  ...next,
  {
    files: ['app/**/*.{ts,tsx}', 'components/**/*.{ts,tsx}'],
    rules: { 'no-restricted-imports': ['error', { patterns: [DATABASE] }] },
  },
  {
    // The browser's API client takes the server's shapes as types only, so no server code reaches the bundle.
    files: ['lib/api-client.ts'],
    rules: {
      '@typescript-eslint/no-restricted-imports': [
        'error',
        { patterns: [{ group: ['@/*', 'sequelize', 'pg', 'next/server'], allowTypeImports: true, message: 'lib/api-client.ts imports the server\'s code as types only (import type).' }] },
      ],
    },
  },
];
