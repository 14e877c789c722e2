import { describe, expect, it } from 'vitest';
import path from 'node:path';
import sharp from 'sharp';
import type { BrowserContext, Page } from 'playwright-core';
import { useAppInBrowser } from '../setup/e2e.js';
import { ARTIFACTS, homeScreenPoint, signInAs, waitForMapIdle } from '../setup/browser.js';
import { demoUser } from '../setup/demo.js';
import { ApiClient } from '../setup/test-app.js';

const app = useAppInBrowser();

type MapHandle = {
  loaded(): boolean;
  areTilesLoaded(): boolean;
  isMoving(): boolean;
  queryRenderedFeatures(o: { layers: string[] }): { id?: number; properties: Record<string, unknown> }[];
};

/** The outcome property of the home's symbol as MapLibre drew it from the homes tiles (null when not drawn). */
const drawnOutcome = async (page: Page, homeRef: number) => (await homeScreenPoint(page, homeRef))?.outcome ?? null;

/** A small real JPEG, as a phone camera would give. */
async function cameraPhoto(): Promise<Buffer> {
  const width = 48;
  const height = 32;
  const pixels = Buffer.alloc(width * height * 3);
  for (let i = 0; i < width * height; i += 1) {
    pixels[i * 3] = (i * 7) % 256;
    pixels[i * 3 + 1] = 110;
    pixels[i * 3 + 2] = 116;
  }
  return sharp(pixels, { raw: { width, height, channels: 3 } }).jpeg({ quality: 80 }).toBuffer();
}

async function notVisitedHome(page: Page, skip: string[] = []): Promise<{ id: string; ref: number; address: string }> {
  const list = await page.evaluate(() => fetch('/api/homes?outcome=not_visited&limit=20').then((r) => r.json()));
  const home = (list.homes as { id: string; ref: number; address: string }[]).find((h) => !skip.includes(h.id));
  if (!home) throw new Error('the demo company has no home left that was never visited');
  return home;
}

async function waitUntilSent(page: Page) {
  await page.waitForFunction(() => !/Waiting to send/.test(document.querySelector('[data-testid="outbox-status"]')?.textContent ?? ''), undefined, { timeout: 30_000 });
}

describe('recording a visit on a phone', () => {
  let firstHomeId = '';

  it('keeps a visit and its photo while offline, sends them once online, and the map shows the new outcome', async () => {
    const context: BrowserContext = await app.browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    const visitPosts: string[] = [];
    const photoPuts: string[] = [];
    page.on('request', (r) => {
      if (r.method() === 'POST' && /\/api\/homes\/[^/]+\/visits$/.test(new URL(r.url()).pathname)) visitPosts.push(String(r.postDataJSON()?.id));
      if (r.method() === 'PUT' && new URL(r.url()).pathname.includes('/attachments/')) photoPuts.push(r.url());
    });
    await signInAs(page, app.baseUrl, 'technician');
    await waitForMapIdle(page, 'visits');

    const home = await notVisitedHome(page);
    firstHomeId = home.id;
    const search = page.getByRole('combobox', { name: 'Find an address' });
    await search.fill(home.address);
    await page.getByRole('option').first().waitFor();
    await search.press('Enter');
    await expect(page.getByTestId('home-address').textContent()).resolves.toBe(home.address);
    await waitForMapIdle(page, 'visits');
    expect(await drawnOutcome(page, home.ref)).toBe('not_visited');

    await page.getByRole('link', { name: 'Record a visit' }).click();
    await page.waitForURL(new RegExp(`/homes/${home.id}/visit$`));
    await page.getByRole('button', { name: 'Save visit' }).waitFor();

    // The signal goes in the utility room.
    await context.setOffline(true);
    const fanSelect = page.locator('select[name="fanId"]');
    const fanOptions = await fanSelect.locator('option').count();
    expect(fanOptions).toBeGreaterThan(1); // "No fan installed" plus the company's fans
    await fanSelect.selectOption({ index: 1 });
    await page.locator('input[name="fanLocation"]').fill('garage attic');
    await page.locator('input[name="vacuumInWc"]').fill('1.2');
    await page.getByText('3"', { exact: true }).click();
    await page.locator('input[name="pipeLengthFt"]').fill('20');
    await page.locator('input[name="elbows"]').fill('3');
    // The inputs bring up the decimal keypad, and every reading has its unit beside it.
    expect(await page.locator('input[name="vacuumInWc"]').getAttribute('inputmode')).toBe('decimal');
    await expect(page.getByText('in. WC', { exact: true }).first().isVisible()).resolves.toBe(true);

    // Diagnostics update as the readings go in, with the shared fan/pipe maths.
    const hint = page.getByTestId('vacuum-hint');
    await hint.waitFor();
    expect(['typical', 'starved', 'leaky', 'out_of_range']).toContain(await hint.getAttribute('data-kind'));
    const diagnostics = page.getByRole('region', { name: 'Diagnostics' });
    await expect(diagnostics.textContent()).resolves.toMatch(/about \d+ CFM/);
    await expect(page.getByRole('complementary', { name: 'Caution: Fan wiring is electrical work' }).isVisible()).resolves.toBe(true);

    await page.locator('input[type="file"]').setInputFiles({ name: 'manometer.jpg', mimeType: 'image/jpeg', buffer: await cameraPhoto() });
    await page.getByRole('img', { name: 'Photo of the manometer' }).waitFor();
    await page.screenshot({ path: path.join(ARTIFACTS, 'visit-form-phone.png') });
    // The whole form at phone width in one picture (the page scrolls inside the app shell).
    await page.setViewportSize({ width: 390, height: 3400 });
    await page.screenshot({ path: path.join(ARTIFACTS, 'visit-form-phone-whole.png') });
    await page.setViewportSize({ width: 390, height: 844 });

    await page.getByRole('button', { name: 'Save visit' }).click();
    await page.waitForURL((u) => u.pathname === '/' && u.searchParams.get('home') === home.id);
    const status = page.getByRole('status').filter({ hasText: 'Waiting to send (2)' });
    await status.waitFor();
    await expect(page.getByTestId('home-waiting').textContent()).resolves.toContain('1 visit, 1 photo');
    await page.screenshot({ path: path.join(ARTIFACTS, 'visit-queued-offline.png') });

    // Nothing reached the server while offline.
    const api = new ApiClient(app.baseUrl);
    await api.signIn(demoUser('technician'));
    expect((await api.get(`/api/homes/${home.id}`)).body.visits).toHaveLength(0);
    expect(visitPosts).toHaveLength(0);

    await context.setOffline(false);
    await waitUntilSent(page);
    await page.screenshot({ path: path.join(ARTIFACTS, 'visit-sent.png') });

    const detail = (await api.get(`/api/homes/${home.id}`)).body;
    expect(detail.visits).toHaveLength(1);
    const [visit] = detail.visits;
    expect(visitPosts).toContain(visit.id);
    expect(new Set(visitPosts)).toEqual(new Set([visit.id])); // any resend carried the same id
    expect(visit.vacuumPa).toBeCloseTo(1.2 * 249.0889, 1);
    expect(visit).toMatchObject({ pipeSizeIn: 3, pipeLengthFt: 20, elbows: 3, fanLocation: 'garage attic', status: 'completed' });
    const photos = visit.attachments.filter((a: { kind: string }) => a.kind === 'photo');
    expect(photos).toHaveLength(1);
    expect(photos[0]).toMatchObject({ subject: 'manometer', contentType: 'image/jpeg' });
    expect(photoPuts.length).toBeGreaterThanOrEqual(1);

    // The map's homes tiles were asked for again: the home's symbol now carries its new outcome.
    await page.waitForFunction(
      (ref) => {
        const map = (window as unknown as { __tractwiseMap?: MapHandle }).__tractwiseMap;
        const hit = map?.queryRenderedFeatures({ layers: ['homes-outcome'] }).find((f) => f.id === ref);
        return Boolean(hit && hit.properties.outcome !== 'not_visited');
      },
      home.ref,
      { timeout: 30_000, polling: 250 },
    );
    expect(await drawnOutcome(page, home.ref)).toBe(detail.home.outcome);
    expect(detail.home.outcome).toBe('awaiting_test');
    // The panel refreshed too, and shows the photo's thumbnail.
    await page.getByRole('list', { name: 'Photos' }).getByRole('img').waitFor();
    await page.screenshot({ path: path.join(ARTIFACTS, 'visit-map-after.png') });
    await context.close();
  });

  it('opens the visit form offline after one online visit (service worker) and sends what was saved there', async () => {
    const context = await app.browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    await signInAs(page, app.baseUrl, 'technician');
    const home = await notVisitedHome(page, [firstHomeId]);
    // The first online visit installs the service worker and lets it cache the app shell.
    await page.goto(`${app.baseUrl}/homes/${home.id}/visit`);
    await page.getByRole('button', { name: 'Save visit' }).waitFor();
    await page.evaluate(() => navigator.serviceWorker.ready.then(() => undefined));

    await context.setOffline(true);
    await page.reload();
    await page.getByRole('heading', { name: 'Record a visit' }).waitFor({ timeout: 15_000 });
    await page.getByText('No access', { exact: true }).click();
    await page.locator('textarea[name="notes"]').fill('Gate locked; left a door hanger.');
    await page.locator('select').filter({ hasText: 'Manometer' }).first().selectOption('other');
    await page.locator('input[type="file"]').setInputFiles({ name: 'gate.jpg', mimeType: 'image/jpeg', buffer: await cameraPhoto() });
    await page.getByRole('img', { name: 'Other photo' }).waitFor();
    await page.getByRole('button', { name: 'Save visit' }).click();
    await page.getByRole('status').filter({ hasText: 'Waiting to send (2)' }).waitFor();
    // Back on the map page (its code comes from the service worker's cache too).
    await page.waitForURL((u) => u.pathname === '/' && u.searchParams.get('home') === home.id);
    await page.getByRole('button', { name: 'Filters and style' }).waitFor();
    await page.screenshot({ path: path.join(ARTIFACTS, 'visit-offline-shell.png') });

    // The visit and the photo's bytes live in IndexedDB: a reload (or a flat battery) loses nothing.
    await page.reload();
    await page.getByRole('status').filter({ hasText: 'Waiting to send (2)' }).waitFor({ timeout: 15_000 });

    await context.setOffline(false);
    await waitUntilSent(page);
    const api = new ApiClient(app.baseUrl);
    await api.signIn(demoUser('technician'));
    const detail = (await api.get(`/api/homes/${home.id}`)).body;
    expect(detail.visits).toHaveLength(1);
    expect(detail.visits[0]).toMatchObject({ status: 'no_access', notes: 'Gate locked; left a door hanger.' });
    expect(detail.visits[0].attachments).toMatchObject([{ kind: 'photo', subject: 'other', contentType: 'image/jpeg' }]);
    const thumbnail = await fetch(`${app.baseUrl}/api/attachments/${detail.visits[0].attachments[0].id}/thumbnail`, { headers: { Cookie: api.cookie } });
    expect(thumbnail.status).toBe(200);
    expect(thumbnail.headers.get('content-type')).toMatch(/^image\//);
    expect(detail.home.outcome).toBe('declined');
    await context.close();
  });

  it('records a post-mitigation test with its lab report, warning live about timing and length without blocking', async () => {
    const context = await app.browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    await signInAs(page, app.baseUrl, 'technician');
    await page.goto(`${app.baseUrl}/homes/${firstHomeId}/test`);
    await page.getByRole('button', { name: 'Save test' }).waitFor();
    // The home was activated in the first test: post-mitigation by default, the fan time from that visit.
    expect(await page.getByRole('radio', { name: 'Post-mitigation' }).isChecked()).toBe(true);
    const fanAt = await page.locator('input[name="fanActivatedAt"]').inputValue();
    expect(fanAt).not.toBe('');

    // Started 2 h after the fan, ran 24 h: both practice checks speak up.
    const [start, end] = await page.evaluate((fan) => {
      const local = (d: Date) => new Date(d.getTime() - d.getTimezoneOffset() * 60_000).toISOString().slice(0, 16);
      const fanMs = new Date(fan).getTime();
      return [local(new Date(fanMs + 2 * 3_600_000)), local(new Date(fanMs + 26 * 3_600_000))];
    }, fanAt);
    await page.locator('select[name="device"]').selectOption('charcoal');
    await page.locator('input[name="startedAt"]').fill(start);
    await page.locator('input[name="endedAt"]').fill(end);
    await page.locator('input[name="result"]').fill('2.1');
    await page.getByLabel('Result unit').selectOption('pCi/L');
    const warnings = page.getByTestId('test-warnings');
    await warnings.waitFor();
    await expect(warnings.textContent()).resolves.toMatch(/started 2\.0 h after the fan.*MAH-2019 §7\.3\.2/);
    await expect(warnings.textContent()).resolves.toMatch(/at least 48 h.*402-R-92-003/);

    const pdf = Buffer.from('%PDF-1.4\n1 0 obj << /Type /Catalog /Pages 2 0 R >> endobj\n2 0 obj << /Type /Pages /Kids [] /Count 0 >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n');
    await page.locator('input[type="file"][accept="application/pdf"]').setInputFiles({ name: 'lab-report.pdf', mimeType: 'application/pdf', buffer: pdf });
    await page.getByText('lab-report.pdf', { exact: false }).waitFor();
    await page.screenshot({ path: path.join(ARTIFACTS, 'radon-test-form-phone.png') });
    await page.getByRole('button', { name: 'Save test' }).click();
    await page.waitForURL((u) => u.pathname === '/' && u.searchParams.get('home') === firstHomeId);
    await waitUntilSent(page);

    const api = new ApiClient(app.baseUrl);
    await api.signIn(demoUser('technician'));
    const detail = (await api.get(`/api/homes/${firstHomeId}`)).body;
    expect(detail.tests).toHaveLength(1);
    const [test] = detail.tests;
    expect(test.resultBqM3).toBeCloseTo(2.1 * 37, 6); // 1 pCi/L = 37 Bq/m³ (definition of the curie)
    expect(test.warnings.map((w: { code: string }) => w.code).sort()).toEqual(['POST_TEST_TOO_SOON', 'SHORT_TERM_UNDER_48H']);
    expect(test.attachments.filter((a: { kind: string }) => a.kind === 'lab_report')).toHaveLength(1);
    await context.close();
  });
});
