// Makes the README's screenshot of the picture report (docs/picture-report.png) from the bundled
// examples: in a scratch repository, the kidney-pair classifier (examples/renal-pair-net.yaml) is
// committed as the base and its trimmed copy (examples/renal-pair-net-trimmed.yaml) put in its
// place, as a pull request would; `rankfloor check --base HEAD --picture` writes the report, and
// Debian's headless Chromium photographs its first panel (the failing requirement).
//
// Usage: npm run build && node scripts/picture-screenshot.mjs [--out FILE]
import { spawnSync } from 'node:child_process';
import { copyFileSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { parseArgs } from 'node:util';
import { openChromium } from '../tests/helpers/chromium.mjs';

const ROOT = fileURLToPath(new URL('..', import.meta.url));
const { values } = parseArgs({ options: { out: { type: 'string' } }, strict: true });
const out = resolve(process.cwd(), values.out ?? join(ROOT, 'docs', 'picture-report.png'));

const scratch = mkdtempSync(join(tmpdir(), 'rankfloor-screenshot-'));
const run = (cmd, args) => {
  const r = spawnSync(cmd, args, { cwd: scratch, encoding: 'utf8' });
  if (r.error) throw r.error;
  return r;
};
const git = (...args) => {
  const r = run('git', ['-c', 'user.name=rankfloor', '-c', 'user.email=rankfloor@example.invalid', '-c', 'commit.gpgsign=false', ...args]);
  if (r.status !== 0) throw new Error(`git ${args.join(' ')}: ${r.stderr}`);
};
try {
  for (const f of ['policies/org-base.yaml', 'policies/paired-organ-scans.yaml', 'examples/renal-pair-net.yaml']) {
    mkdirSync(dirname(join(scratch, f)), { recursive: true });
    copyFileSync(join(ROOT, f), join(scratch, f));
  }
  git('init', '-q');
  git('add', '.');
  git('commit', '-q', '-m', 'base');
  writeFileSync(join(scratch, 'examples/renal-pair-net.yaml'), readFileSync(join(ROOT, 'examples/renal-pair-net-trimmed.yaml')));
  const html = join(scratch, 'picture.html');
  const check = run(process.execPath, [join(ROOT, 'build/bin/rankfloor.js'), 'check', '--policy', 'policies', '--base', 'HEAD', '--picture', html]);
  if (check.status !== 1) throw new Error(`expected the trimmed config to fail (exit 1), got ${check.status}: ${check.stderr}`);
  const browser = await openChromium();
  try {
    const page = await browser.context.newPage();
    await page.setViewportSize({ width: 1060, height: 900 });
    await page.goto(pathToFileURL(html).href);
    mkdirSync(dirname(out), { recursive: true });
    await page.locator('section.panel').first().screenshot({ path: out });
  } finally {
    await browser.close();
  }
  process.stdout.write(`wrote ${out}\n`);
} finally {
  rmSync(scratch, { recursive: true, force: true });
}
