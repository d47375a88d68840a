import next from 'eslint-config-next';

export default [
  { ignores: ['.next*/**', 'node_modules/**', '.data/**', 'next-env.d.ts'] },
  ...next,
];
