import { describe, expect, it } from 'vitest';
import path from 'node:path';
import { useAppInBrowser } from '../setup/e2e.js';
import { ARTIFACTS, homeScreenPoint, signInAs, waitForMapIdle } from '../setup/browser.js';
import { demoUser } from '../setup/demo.js';
import { ApiClient } from '../setup/test-app.js';

const app = useAppInBrowser();

describe('the map', () => {
  it('draws the demo town with street labels from this origin only, and opens a tapped home', async () => {
    const api = new ApiClient(app.baseUrl);
    await api.signIn(demoUser('technician'));
    const target = (await api.get('/api/homes?limit=1&q=1')).body.homes[0];

    const context = await app.browser.newContext({ viewport: { width: 1280, height: 800 } });
    const page = await context.newPage();
    const requests: string[] = [];
    page.on('request', (r) => requests.push(r.url()));
    await signInAs(page, app.baseUrl, 'technician');
    await waitForMapIdle(page, 'map');

    // Street names are drawn: rendered label features from the basemap's symbol layers.
    const labels = await page.evaluate(() => {
      const map = (window as unknown as { __tractwiseMap: { getStyle(): { layers: { id: string; type: string; source?: string }[] }; queryRenderedFeatures(o: { layers: string[] }): { properties: Record<string, unknown> }[] } }).__tractwiseMap;
      const ids = map.getStyle().layers.filter((l) => l.type === 'symbol' && l.source === 'base').map((l) => l.id);
      return map.queryRenderedFeatures({ layers: ids }).map((f) => String(f.properties.name ?? ''));
    });
    expect(labels.filter(Boolean).length).toBeGreaterThan(0);
    await page.screenshot({ path: path.join(ARTIFACTS, 'map-demo-town.png') });

    // Find the home by address (keyboard only), which flies the map to it.
    const search = page.getByRole('combobox', { name: 'Find an address' });
    await search.fill(target.address);
    await page.getByRole('option').first().waitFor();
    await search.press('ArrowDown');
    await search.press('ArrowUp');
    await search.press('Enter');
    await expect(page.getByTestId('home-address').textContent()).resolves.toBe(target.address);
    await page.getByRole('button', { name: 'Close home panel' }).click();
    await waitForMapIdle(page, 'map');

    // Tap the home where MapLibre drew it (the fly-to left it in view).
    const point = await homeScreenPoint(page, target.ref);
    expect(point).not.toBeNull();
    await page.mouse.click(point!.x, point!.y);
    await page.getByTestId('home-address').waitFor();
    expect(await page.getByTestId('home-address').textContent()).toBe(target.address);
    expect(new URL(page.url()).searchParams.get('home')).toBe(target.id);
    // The ring around the selected home: drawn for the feature whose id is the home's short number.
    await page.waitForFunction(
      (ref) =>
        (window as unknown as { __tractwiseMap: { queryRenderedFeatures(o: { layers: string[] }): { id?: number }[] } }).__tractwiseMap
          .queryRenderedFeatures({ layers: ['homes-selected'] })
          .some((f) => f.id === ref),
      target.ref,
      { timeout: 10_000, polling: 200 },
    );
    await page.screenshot({ path: path.join(ARTIFACTS, 'map-home-panel.png') });

    // Without a connection, a home opened before on this device still opens from a tap.
    await page.getByRole('button', { name: 'Close home panel' }).click();
    await page.getByTestId('home-address').waitFor({ state: 'detached' });
    await context.setOffline(true);
    await page.mouse.click(point!.x, point!.y);
    await page.getByTestId('home-address').waitFor();
    expect(await page.getByTestId('home-address').textContent()).toBe(target.address);
    await context.setOffline(false);

    // Every request the page made went to the app's own origin.
    const foreign = requests.filter((u) => !u.startsWith(app.baseUrl) && !u.startsWith('data:') && !u.startsWith('blob:'));
    expect(foreign).toEqual([]);
    expect(requests.some((u) => u.includes('/glyphs/'))).toBe(true);
    expect(requests.some((u) => u.includes('/tiles/homes/'))).toBe(true);
    await context.close();
  });

  it('draws the homes after the user left the map before it finished loading', async () => {
    const context = await app.browser.newContext({ viewport: { width: 1280, height: 800 } });
    const page = await context.newPage();
    await signInAs(page, app.baseUrl, 'technician');
    // Leave at once: the map keeps loading off-screen and is reused when the user comes back.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Homes' }).click();
    await page.getByRole('table').waitFor();
    await page.waitForTimeout(3000);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Map' }).click();
    await waitForMapIdle(page, 'map-reused');
    // Symbols are placed over a few frames after the tiles arrive: wait for them, up to 15 s.
    await page.waitForFunction(() => {
      const map = (window as unknown as { __tractwiseMap: { queryRenderedFeatures(o: { layers: string[] }): unknown[] } }).__tractwiseMap;
      return map.queryRenderedFeatures({ layers: ['homes-outcome'] }).length > 0;
    }, undefined, { timeout: 15_000, polling: 250 });
    await context.close();
  });

  it('keeps filters in the URL and restores camera and filters after a reload', async () => {
    const context = await app.browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    await signInAs(page, app.baseUrl, 'manager');
    await waitForMapIdle(page, 'map');
    await page.getByRole('button', { name: 'Filters and style' }).click();
    await page.getByLabel('Show homes by').selectOption('vacuum');
    await page.getByRole('checkbox', { name: 'Above the action level or needs rework' }).check();
    await page.waitForURL(/style=vacuum/);
    expect(page.url()).toContain('outcome=needs_rework');
    await expect(page.getByRole('region', { name: 'Legend' }).textContent()).resolves.toContain('in. WC');

    await page.evaluate(() => (window as unknown as { __tractwiseMap: { jumpTo(o: object): void } }).__tractwiseMap.jumpTo({ zoom: 15.5 }));
    await waitForMapIdle(page, 'map');
    await page.reload();
    await waitForMapIdle(page, 'map');
    expect(page.url()).toContain('style=vacuum');
    const zoom = await page.evaluate(() => (window as unknown as { __tractwiseMap: { getZoom(): number } }).__tractwiseMap.getZoom());
    expect(zoom).toBeCloseTo(15.5, 1);
    // Opening the map from the navigation brings the same filters back.
    await page.goto(app.baseUrl + '/');
    await page.waitForURL(/style=vacuum/);
    await page.screenshot({ path: path.join(ARTIFACTS, 'map-phone-vacuum.png') });
    await context.close();
  });
});
