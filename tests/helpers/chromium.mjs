// Debian's Chromium (/usr/bin/chromium, `apt-get install chromium`; .ci/run installs it), driven by
// playwright-core, which never downloads a browser of its own. The flags keep a headless run off
// the network (no background requests, component updates or sync) and out of any profile: each
// launch gets a fresh user-data directory, removed on close.
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium } from 'playwright-core';

export const CHROMIUM = '/usr/bin/chromium';

const FLAGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

export async function openChromium() {
  if (!existsSync(CHROMIUM)) {
    throw new Error(`${CHROMIUM} is missing: install Debian's chromium package (apt-get install chromium), as .ci/run does`);
  }
  const profile = mkdtempSync(join(tmpdir(), 'rankfloor-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    headless: true,
    args: FLAGS,
    viewport: { width: 1280, height: 900 },
    deviceScaleFactor: 1,
  });
  return {
    context,
    close: async () => {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}
