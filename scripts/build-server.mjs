// Bundles our HTTP server (server.ts and the few lib/http modules it imports) into one plain
// JavaScript file beside Next's build, so serving processes run without a TypeScript loader: tsx
// keeps a module-loading thread with a JavaScript engine of its own in every process, about 85 MB
// of each at the 100 000-curve library (README § Reliability). Packages stay imports, not copies.
//   node scripts/build-server.mjs      (part of `npm run build`)
import { build } from 'esbuild';
import { rmSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = path.dirname(path.dirname(fileURLToPath(import.meta.url)));
const dist = process.env.NEXT_DIST_DIR ?? '.next';
const outdir = path.join(root, dist, 'bandcone-server');

rmSync(outdir, { recursive: true, force: true });
// Split, so what server.ts imports only when serving (Next, the database's health) stays out of a
// supervising process: it loads server.mjs alone.
await build({
  entryPoints: [path.join(root, 'server.ts')],
  outdir,
  outExtension: { '.js': '.mjs' },
  splitting: true,
  bundle: true,
  platform: 'node',
  format: 'esm',
  target: 'node20',
  packages: 'external',
  logLevel: 'warning',
  banner: { js: '// Built from server.ts by scripts/build-server.mjs; edit that, not this.' },
});
console.log(`server bundled: ${path.relative(root, path.join(outdir, 'server.mjs'))}`);
