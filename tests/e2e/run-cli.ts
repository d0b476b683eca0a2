/**
 * Runs the built CLI (the package's bin, `build/bin/rankfloor.js`, made by `npm run build`, which
 * `npm test` runs first) as a child process, the way a CI job or a user's shell does.
 */
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

export const REPO = fileURLToPath(new URL('../..', import.meta.url));
export const CLI = fileURLToPath(new URL('../../build/bin/rankfloor.js', import.meta.url));

export interface CliRun {
  code: number;
  stdout: string;
  stderr: string;
}

export function runCli(args: readonly string[], cwd = REPO, env: NodeJS.ProcessEnv = {}): CliRun {
  if (!existsSync(CLI)) throw new Error(`${CLI} is missing: run 'npm run build' first (npm test does)`);
  const r = spawnSync(process.execPath, [CLI, ...args], { cwd, encoding: 'utf8', env: { ...process.env, NO_COLOR: '1', ...env } });
  return { code: r.status ?? -1, stdout: r.stdout, stderr: r.stderr };
}
