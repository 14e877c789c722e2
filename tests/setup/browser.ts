import fs from 'node:fs';
import path from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';

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

type DemoRole = 'admin' | 'manager' | 'estimator' | 'technician' | 'sales';

/** Signs a demo user in through the sign-in page and waits until the app has left it. */
export async function signInAs(page: Page, baseUrl: string, role: DemoRole) {
  const { demoUser } = await import('./demo.js');
  await page.goto(baseUrl + '/sign-in');
  await page.getByLabel('E-mail').fill(demoUser(role));
  await page.getByLabel('Password').fill('demo-pass-2026');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
}

/** Waits until MapLibre has loaded its style and drawn every tile in view; on timeout, says why and keeps a screenshot. */
export async function waitForMapIdle(page: Page, name = 'map') {
  try {
    // The homes source must be on the map too: React adds it after the style loads (and again when a
    // reused map comes back), and until then "all tiles loaded" is true of the basemap alone.
    await page.waitForFunction(() => {
      const map = (window as unknown as { __tractwiseMap?: { loaded(): boolean; areTilesLoaded(): boolean; isMoving(): boolean; getSource(id: string): unknown; isSourceLoaded(id: string): boolean } }).__tractwiseMap;
      return Boolean(map && map.loaded() && map.getSource('homes') && map.isSourceLoaded('homes') && map.areTilesLoaded() && !map.isMoving());
    }, undefined, { timeout: 30_000, polling: 200 });
  } catch (err) {
    const state = await page.evaluate(() => {
      const m = (window as unknown as { __tractwiseMap?: { loaded(): boolean; areTilesLoaded(): boolean; isMoving(): boolean } }).__tractwiseMap;
      return m ? { loaded: m.loaded(), tiles: m.areTilesLoaded(), moving: m.isMoving() } : null;
    });
    await page.screenshot({ path: path.join(ARTIFACTS, `${name}-not-idle.png`) });
    throw new Error(`map not idle at ${page.url()}: ${JSON.stringify(state)} (${(err as Error).message})`);
  }
  await page.waitForTimeout(300);
}

/**
 * Where MapLibre drew a home (page coordinates), from the rendered features of the homes layer; null if
 * not in view. Homes tiles carry the home's short number (ref) as the feature id.
 */
export async function homeScreenPoint(page: Page, homeRef: number) {
  return page.evaluate((ref) => {
    const map = (window as unknown as { __tractwiseMap: { getCanvas(): HTMLCanvasElement; queryRenderedFeatures(o: { layers: string[] }): { id?: number; properties: Record<string, unknown>; geometry: { coordinates: [number, number] } }[]; project(c: [number, number]): { x: number; y: number } } }).__tractwiseMap;
    const hit = map.queryRenderedFeatures({ layers: ['homes-outcome'] }).find((f) => f.id === ref);
    if (!hit) return null;
    const rect = map.getCanvas().getBoundingClientRect();
    const p = map.project(hit.geometry.coordinates);
    return { x: rect.left + p.x, y: rect.top + p.y, outcome: String(hit.properties.outcome ?? '') };
  }, homeRef);
}
