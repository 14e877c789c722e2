import { describe, expect, it } from 'vitest';
import path from 'node:path';
import { useAppInBrowser } from '../setup/e2e.js';
import { ARTIFACTS } from '../setup/browser.js';
import { demoCompanyName, demoUser } from '../setup/demo.js';

const app = useAppInBrowser();

describe('signing in through the browser', () => {
  it('sends a signed-out visitor to sign-in, lets the technician in, shows the shell, and signs out', async () => {
    const context = await app.browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    await page.goto(app.baseUrl + '/homes');
    await page.waitForURL(/\/sign-in\?next=%2Fhomes/);

    await page.getByLabel('E-mail').fill(demoUser('technician'));
    await page.getByLabel('Password').fill('demo-pass-2026');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(app.baseUrl + '/homes');

    const nav = page.getByRole('navigation', { name: 'Main' });
    // The shell renders once the session query answers; wait for it rather than sampling once.
    await nav.getByRole('link', { name: 'Map' }).waitFor({ state: 'visible' });
    // A technician never sees navigation it cannot use.
    await expect(nav.getByRole('link', { name: 'Settings' }).count()).resolves.toBe(0);
    await expect(nav.getByRole('link', { name: 'Builders' }).count()).resolves.toBe(0);
    await page.getByRole('table').waitFor();
    await page.screenshot({ path: path.join(ARTIFACTS, 'shell-technician-phone.png') });

    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL(/\/sign-in/);
    await page.goto(app.baseUrl + '/');
    await page.waitForURL(/\/sign-in/);
    await context.close();
  });

  it('shows the admin the settings page with the company name', async () => {
    const context = await app.browser.newContext({ viewport: { width: 1280, height: 800 } });
    const page = await context.newPage();
    await page.goto(app.baseUrl + '/sign-in');
    await page.getByLabel('E-mail').fill(demoUser('admin'));
    await page.getByLabel('Password').fill('demo-pass-2026');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByRole('link', { name: 'Settings' }).click();
    await page.getByRole('heading', { name: 'People and roles' }).waitFor();
    expect(await page.getByTestId('signed-in-as').textContent()).toContain(demoCompanyName());
    await page.screenshot({ path: path.join(ARTIFACTS, 'settings-admin-desktop.png') });
    await context.close();
  });
});
