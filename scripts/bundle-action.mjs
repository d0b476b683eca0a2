// Bundles the GitHub Action (src/action/index.ts) into one ESM file, dist/action.js (plus the base
// evaluation's worker thread, dist/base-worker.js), that the
// runner starts without `npm install`: GitHub runs a JavaScript action straight from its checked-out
// repository, so every dependency has to be inside the committed file. The bundle must be a pure
// function of the sources and the locked dependencies, because a test rebuilds it and fails on any
// byte of difference from the committed copy.
//
// The JSON Schemas are not copied: the loaders look for `../schema/` relative to their module, and
// from dist/action.js that is the repository's own schema/ directory, which ships with the action.
//
// Usage: node scripts/bundle-action.mjs [--outdir DIR]   (default: dist)
import { mkdirSync, writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { build } from 'esbuild';

const ROOT = fileURLToPath(new URL('..', import.meta.url));
const { values } = parseArgs({ options: { outdir: { type: 'string' } }, strict: true });
const outdir = resolve(process.cwd(), values.outdir ?? resolve(ROOT, 'dist'));

// Some bundled CommonJS packages call require() for Node built-ins at run time; an ES module has no
// require of its own, so the bundle makes one before any of them runs.
const REQUIRE_BANNER = "import { createRequire as __createRequire } from 'module'; const require = __createRequire(import.meta.url);";

mkdirSync(outdir, { recursive: true });
const result = await build({
  // Fixed, so that the path comments esbuild writes into the bundle do not depend on where the
  // script was started.
  absWorkingDir: ROOT,
  // The worker thread that evaluates base versions beside the heads is a file of its own, which
  // the action finds next to itself (src/check/base-evaluation.ts).
  entryPoints: { action: 'src/action/index.ts', 'base-worker': 'src/check/base-worker.ts' },
  outdir,
  bundle: true,
  platform: 'node',
  format: 'esm',
  target: 'node20',
  banner: { js: REQUIRE_BANNER },
  minify: false,
  sourcemap: false,
  legalComments: 'eof',
  charset: 'utf8',
  logLevel: 'warning',
  metafile: false,
});
if (result.errors.length > 0) process.exit(1);
// Node decides between CommonJS and ESM by the nearest package.json; this one says ESM whatever
// the surrounding repository declares.
writeFileSync(resolve(outdir, 'package.json'), JSON.stringify({ type: 'module' }, null, 2) + '\n');
