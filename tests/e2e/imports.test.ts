import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { useAppInBrowser } from '../setup/e2e.js';
import { ARTIFACTS, homeScreenPoint, signInAs, waitForMapIdle } from '../setup/browser.js';
import { startFakeGeocoder, type FakeGeocoder } from '../../server/fakes/geocoder.js';

const FIXTURE = path.resolve('tests/fixtures/addresses-browser.csv');

let geocoder: FakeGeocoder;
beforeAll(async () => {
  geocoder = await startFakeGeocoder(0);
});
afterAll(async () => {
  await geocoder?.close();
});
const app = useAppInBrowser(() => ({ GEOCODER_URL: geocoder.url }));

describe('importing addresses in the browser', () => {
  it('uploads a file, maps a column, previews, imports, and finds the new homes on the map', async () => {
    const context = await app.browser.newContext({ viewport: { width: 1280, height: 800 } });
    const page = await context.newPage();
    await signInAs(page, app.baseUrl, 'estimator');
    await page.getByRole('link', { name: 'Import addresses' }).click();
    await page.waitForURL(/\/imports$/);

    await page.setInputFiles('#import-file', FIXTURE);
    await expect(page.getByText('addresses-browser.csv').first().textContent()).resolves.toBeTruthy();
    // "Situs" is no header the guesser knows: the preview waits for the street address column.
    await page.getByRole('alert').filter({ hasText: 'Map these before importing' }).waitFor();
    expect(await page.getByLabel('Street address').inputValue()).toBe('');
    // The other columns were guessed from their names.
    expect(await page.getByLabel('City').inputValue()).toBe('Town');
    expect(await page.getByLabel('ZIP').inputValue()).toBe('Zip Code');
    await page.getByLabel('Street address').selectOption('Situs');

    const preview = page.getByTestId('import-preview');
    await preview.waitFor();
    const previewText = await preview.textContent();
    expect(previewText).toContain('2093 Fennel Ridge Dr');
    expect(previewText).toContain('Tarrowby, ZZ 00091');
    expect(previewText).toContain('from the geocoder');
    await page.screenshot({ path: path.join(ARTIFACTS, 'imports-preview-desktop.png'), fullPage: true });

    await page.getByRole('button', { name: 'Import 4 rows' }).click();
    const result = page.getByTestId('import-result');
    await result.waitFor({ timeout: 30_000 });
    expect(await result.textContent()).toContain('4 new, 0 updated, 0 unchanged, 0 with problems');
    // The history lists it, with who imported it and an undo.
    const history = page.getByRole('table', { name: 'Import history' });
    await history.getByText('addresses-browser.csv').waitFor();
    expect(await history.getByRole('button', { name: 'Undo' }).count()).toBeGreaterThan(0);
    await page.screenshot({ path: path.join(ARTIFACTS, 'imports-result-desktop.png'), fullPage: true });

    // On the map: find the address, then tap the home the tiles draw where the map flew to.
    await page.getByRole('link', { name: 'See the homes on the map' }).click();
    await waitForMapIdle(page, 'imports');
    const search = page.getByRole('combobox', { name: 'Find an address' });
    await search.fill('2093 Fennel Ridge');
    const option = page.getByRole('option').filter({ hasText: '2093 Fennel Ridge Dr' }).first();
    await option.waitFor();
    await option.click();
    await expect(page.getByTestId('home-address').textContent()).resolves.toBe('2093 Fennel Ridge Dr');
    await page.getByRole('button', { name: 'Close home panel' }).click();
    await waitForMapIdle(page, 'imports');
    // The map flew to the home: tap it where the homes layer drew it (neighbours sit a few pixels away).
    const homeRef = await page.evaluate(async () => {
      const res = await fetch('/api/homes?limit=1&q=' + encodeURIComponent('2093 Fennel Ridge Dr'));
      return ((await res.json()) as { homes: { ref: number }[] }).homes[0]?.ref ?? null;
    });
    expect(homeRef).not.toBeNull();
    const point = await homeScreenPoint(page, homeRef!);
    expect(point).not.toBeNull();
    await page.mouse.click(point!.x, point!.y);
    await page.getByTestId('home-address').waitFor();
    expect(await page.getByTestId('home-address').textContent()).toBe('2093 Fennel Ridge Dr');
    await page.screenshot({ path: path.join(ARTIFACTS, 'imports-home-on-map.png') });
    await context.close();
  });
});
