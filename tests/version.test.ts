/** The version reports name (SARIF's tool.driver.version) is the package's version. */
import { readFileSync } from 'node:fs';
import { expect, test } from 'vitest';
import { TOOL_VERSION } from '../src/version.js';

test('TOOL_VERSION matches package.json', () => {
  const pkg = JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')) as { version: string };
  expect(TOOL_VERSION).toBe(pkg.version);
});
