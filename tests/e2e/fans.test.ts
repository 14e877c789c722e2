import { describe, expect, it } from 'vitest';
import path from 'node:path';
import type { Page } from 'playwright-core';
import type { FanDto } from '../../shared/schemas/visits.js';
import { useAppInBrowser } from '../setup/e2e.js';
import { ARTIFACTS, signInAs } from '../setup/browser.js';

const app = useAppInBrowser();

/** The fans as the server holds them, read with the page's own session. */
const serverFans = (page: Page) => page.evaluate(() => fetch('/api/fans').then((r) => r.json() as Promise<{ fans: FanDto[] }>));

/** Types a curve into the form's point rows, adding rows as needed. */
async function fillCurve(page: Page, points: [string, string][]) {
  const form = page.getByRole('form', { name: 'Add a fan' });
  for (let i = 0; i < points.length; i++) {
    if ((await form.getByLabel(`Point ${i + 1} airflow`).count()) === 0) await form.getByRole('button', { name: 'Add a point' }).click();
    await form.getByLabel(`Point ${i + 1} airflow`).fill(points[i][0]);
    await form.getByLabel(`Point ${i + 1} static pressure`).fill(points[i][1]);
  }
}

describe('keeping the company fan list', () => {
  it('lets the admin add a fan with its curve, refuses a rising curve and a taken name, and corrects a point', async () => {
    const context = await app.browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await signInAs(page, app.baseUrl, 'admin');
    await page.getByRole('link', { name: 'Settings' }).click();
    await page.getByRole('heading', { name: 'Fans and their curves' }).waitFor();
    const form = page.getByRole('form', { name: 'Add a fan' });

    // Points typed out of order, as a data sheet table might be read.
    await form.getByLabel('Model name').fill('Test fan 90');
    await fillCurve(page, [['100', '0.6'], ['0', '1.2'], ['150', '0.3'], ['50', '0.9']]);
    await form.getByRole('button', { name: 'Add fan' }).click();
    await page.getByRole('status').filter({ hasText: 'Saved Test fan 90.' }).waitFor();

    const row = page.getByRole('table', { name: 'Fans' }).getByRole('row').filter({ hasText: 'Test fan 90' });
    await row.waitFor();
    expect(await row.getByRole('cell').allTextContents()).toEqual(['Test fan 90', '1.2 in. WC', '150 CFM', '4', 'Edit']);
    await page.screenshot({ path: path.join(ARTIFACTS, 'settings-fans.png'), fullPage: true });

    const saved = (await serverFans(page)).fans.find((f) => f.name === 'Test fan 90');
    expect(saved?.maxStaticInWc).toBe(1.2);
    expect(saved?.curve).toEqual([
      { flowCfm: 0, staticInWc: 1.2 },
      { flowCfm: 50, staticInWc: 0.9 },
      { flowCfm: 100, staticInWc: 0.6 },
      { flowCfm: 150, staticInWc: 0.3 },
    ]);

    // A curve whose static pressure rises with flow is refused beside the curve, before it is sent.
    await form.getByLabel('Model name').fill('Test fan 91');
    await fillCurve(page, [['0', '0.5'], ['100', '0.8']]);
    await form.getByRole('button', { name: 'Add fan' }).click();
    await expect(form.getByRole('alert').textContent()).resolves.toBe('Curve: static pressure must not rise with flow');
    expect((await serverFans(page)).fans.some((f) => f.name === 'Test fan 91')).toBe(false);

    // A name already on the list (in any case) comes back from the server, next to the name.
    await form.getByLabel('Model name').fill('test FAN 90');
    await form.getByLabel('Point 2 static pressure').fill('0.4');
    await form.getByRole('button', { name: 'Add fan' }).click();
    await form.getByText('is already used by another fan').waitFor();
    await expect(form.getByRole('alert').count()).resolves.toBe(0);

    // Correcting the no-flow point raises the fan's maximum static pressure everywhere.
    await page.getByRole('button', { name: 'Edit Test fan 90' }).click();
    const edit = page.getByRole('form', { name: 'Edit Test fan 90' });
    await expect(edit.getByLabel('Point 1 static pressure').inputValue()).resolves.toBe('1.2');
    await edit.getByLabel('Point 1 static pressure').fill('1.4');
    await edit.getByRole('button', { name: 'Save changes' }).click();
    await page.getByRole('form', { name: 'Add a fan' }).waitFor();
    await row.getByRole('cell', { name: '1.4 in. WC' }).waitFor();
    const edited = (await serverFans(page)).fans.filter((f) => f.name === 'Test fan 90');
    expect(edited).toHaveLength(1);
    expect(edited[0].maxStaticInWc).toBe(1.4);
    expect(edited[0].curve).toHaveLength(4);
    await context.close();
  });
});
