import type { ChildProcess } from 'node:child_process';
import { afterAll, beforeAll } from 'vitest';
import type { Browser } from 'playwright-core';
import { freePort, startServerProcess, stopServerProcess } from './server-process.js';
import { launchBrowser } from './browser.js';

/**
 * For a browser test file: starts the app as its own process (with its own fake S3) and Debian's
 * Chromium before the tests, and stops both after them. `env` is read when the server starts.
 */
export function useAppInBrowser(env: () => Record<string, string> = () => ({})) {
  let server: ChildProcess | undefined;
  let handle: Awaited<ReturnType<typeof launchBrowser>> | undefined;
  let url = '';
  beforeAll(async () => {
    const port = await freePort();
    server = await startServerProcess(port, env());
    url = `http://127.0.0.1:${port}`;
    handle = await launchBrowser();
  });
  afterAll(async () => {
    await handle?.close();
    if (server) await stopServerProcess(server);
  });
  return {
    get baseUrl(): string {
      return url;
    },
    get browser(): Browser {
      return handle!.browser;
    },
  };
}
