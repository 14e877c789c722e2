import fs from 'node:fs';
import path from 'node:path';
import { chromium, type Browser } from 'playwright-core';

/** Debian's Chromium, headless, with the flags that keep it off the network (never a downloaded browser). */
export async function launchBrowser(): Promise<{ browser: Browser; close(): Promise<void> }> {
  const browser = await chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
  return {
    browser,
    // playwright gives every launch a fresh, temporary profile of its own.
    close: () => browser.close(),
  };
}

export const ARTIFACTS = path.resolve('tests/artifacts');
fs.mkdirSync(ARTIFACTS, { recursive: true });
