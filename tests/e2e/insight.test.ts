import { describe, expect, it } from 'vitest';
import path from 'node:path';
import { useAppInBrowser } from '../setup/e2e.js';
import { ARTIFACTS, signInAs, waitForMapIdle } from '../setup/browser.js';
import { demoUser } from '../setup/demo.js';
import { ApiClient } from '../setup/test-app.js';
import type { BuilderComparisonDto } from '../../shared/schemas/insight.js';

const app = useAppInBrowser();

describe('builder comparison', () => {
  it('shows a manager the chart, and a builder-year cell opens the map filtered to those homes', async () => {
    // The row to click: the demo's most-sampled builder × year × community (from the API, as the page shows it).
    const api = new ApiClient(app.baseUrl);
    await api.signIn(demoUser('manager'));
    const comparison = (await api.get('/api/insight/builders')).body as BuilderComparisonDto;
    const row = [...comparison.rows].sort((a, b) => b.sampled - a.sampled)[0];

    const context = await app.browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    page.on('pageerror', (e) => console.log('page error:', e.message));
    await signInAs(page, app.baseUrl, 'manager');
    // Signing in lands on the map; let it finish loading before leaving it (the map instance is reused later).
    await waitForMapIdle(page, 'insight');
    await page.getByRole('link', { name: 'Compare builders' }).click();
    await page.waitForURL(/\/compare-builders/);

    // The chart: one error bar (Wilson interval) per row, drawn as SVG by the chart library.
    const chart = page.getByTestId('comparison-chart').locator('svg').first();
    await chart.waitFor();
    const rowLabel = `${row.builderName} · ${row.communityName} · ${row.yearBuilt}`;
    await expect(page.getByTestId('comparison-chart').textContent()).resolves.toContain(rowLabel);
    const bars = await page.getByTestId('comparison-chart').locator('svg g[aria-label="rule"] line').count();
    expect(bars).toBeGreaterThanOrEqual(comparison.rows.length);
    await expect(page.getByTestId('pooling-method').textContent()).resolves.toMatch(/empirical-Bayes/);
    await expect(page.getByTestId('backtest').textContent()).resolves.toMatch(/Pooling (helps|does not help)/);
    await page.screenshot({ path: path.join(ARTIFACTS, 'compare-builders.png'), fullPage: true });

    // Sorting by a column keeps every row and reverses on a second click.
    await page.getByRole('button', { name: /^Sampled/ }).click();
    await page.getByRole('button', { name: /^Sampled/ }).click();
    await expect(page.getByRole('columnheader', { name: /^Sampled/ }).first().getAttribute('aria-sort')).resolves.toBe('descending');

    await page.getByRole('link', { name: `Show ${row.builderName} homes built in ${row.yearBuilt} in ${row.communityName} on the map` }).click();
    await page.waitForURL((u) => u.pathname === '/' && u.searchParams.get('builderId') === row.builderId);
    const url = new URL(page.url());
    expect(url.searchParams.get('yearFrom')).toBe(String(row.yearBuilt));
    expect(url.searchParams.get('yearTo')).toBe(String(row.yearBuilt));
    expect(url.searchParams.get('communityId')).toBe(row.communityId);
    await waitForMapIdle(page, 'insight');

    // Fit the view to the community so every one of its homes is drawn, then read what the map drew.
    const community = (await api.get(`/api/communities/${row.communityId}`)).body.community;
    const ring = community.boundary.coordinates[0] as [number, number][];
    const lons = ring.map((p) => p[0]);
    const lats = ring.map((p) => p[1]);
    await page.evaluate((b) => (window as unknown as { __tractwiseMap: { fitBounds(b: number[][], o: object): void } }).__tractwiseMap.fitBounds(b, { padding: 60, animate: false }), [
      [Math.min(...lons), Math.min(...lats)],
      [Math.max(...lons), Math.max(...lats)],
    ]);
    await waitForMapIdle(page, 'insight');
    const drawn = await page.evaluate(() => {
      const map = (window as unknown as { __tractwiseMap: { queryRenderedFeatures(o: { layers: string[] }): { id?: number; properties: Record<string, unknown> }[] } }).__tractwiseMap;
      return map.queryRenderedFeatures({ layers: ['homes-outcome'] }).map((f) => ({ id: Number(f.id), year: Number(f.properties.year) }));
    });
    const ids = new Set(drawn.map((d) => d.id));
    expect(ids.size).toBe(row.homes);
    for (const d of drawn) expect(d.year).toBe(row.yearBuilt);
    await page.screenshot({ path: path.join(ARTIFACTS, 'compare-builders-map.png') });
    await context.close();
  });
});
