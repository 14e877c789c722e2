import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { ApiClient, startTestApp, type TestApp } from '../setup/test-app.js';
import { demoUser, otherCompanyUser } from '../setup/demo.js';
import { startFakeSmtp, type FakeSmtp } from '../../server/fakes/smtp.js';
import { communityQuote } from '../../shared/domain/quote.js';
import type { QuoteDto } from '../../shared/schemas/quotes.js';

let smtp: FakeSmtp;
let app: TestApp;
let estimator: ApiClient;
let manager: ApiClient;
let companyId: string;
let community: { id: string; name: string };

beforeAll(async () => {
  smtp = await startFakeSmtp({ smtpPort: 0 });
  app = await startTestApp({ SMTP_URL: `smtp://127.0.0.1:${smtp.smtpPort}`, MAIL_FROM: 'Quotes <quotes@tarrowby-radon.test>' });
  estimator = new ApiClient(app.url);
  companyId = (await estimator.signIn(demoUser('estimator'))).companyId;
  manager = new ApiClient(app.url);
  await manager.signIn(demoUser('manager'));
  const communities = (await estimator.get('/api/communities')).body.communities as { id: string; name: string }[];
  community = communities.find((c) => c.name === 'Tamarack Bend Phase 2')!;
});
afterAll(async () => {
  await app?.close();
  await smtp?.close();
});

/** Every text item of every page, joined (PDF.js, Mozilla's reader: independent of the PDF writer). */
async function pdfText(bytes: Uint8Array): Promise<string> {
  const doc = await getDocument({ data: bytes, isEvalSupported: false, disableFontFace: true, useSystemFonts: false }).promise;
  const parts: string[] = [];
  for (let i = 1; i <= doc.numPages; i++) {
    const content = await (await doc.getPage(i)).getTextContent();
    parts.push(content.items.map((item) => ('str' in item ? item.str : '')).join(' '));
  }
  await doc.destroy();
  return parts.join('\n').replace(/\s+/g, ' ');
}

const usd = (cents: number) => `$${Math.round(cents / 100).toLocaleString('en-US')}`;

async function sqlCounts() {
  const { rows } = await app.database.pool.query(
    `select count(*)::int as n_total, count(*) filter (where sampled)::int as n, count(*) filter (where sampled and failed)::int as k,
            c.activation_price_cents as activation, c.rework_price_cents as rework, c.quote_confidence as confidence
     from homes h join companies c on c.id = h.company_id where h.company_id = $1 and h.community_id = $2
     group by c.activation_price_cents, c.rework_price_cents, c.quote_confidence`,
    [companyId, community.id],
  );
  return rows[0];
}

describe('community quotes', () => {
  let quote: QuoteDto;

  it("prices a draft from the community's sampled homes with the company's prices (uniform Beta(1, 1) prior)", async () => {
    const res = await estimator.post('/api/quotes', { communityId: community.id, pooled: false, recipientEmail: 'board@tamarack-hoa.test' });
    expect(res.status).toBe(201);
    quote = res.body.quote;
    const c = await sqlCounts();
    expect(quote).toMatchObject({ status: 'draft', homesTotal: c.n_total, homesSampled: c.n, failuresSampled: c.k, priorAlpha: 1, priorBeta: 1 });
    const expected = communityQuote({ homesTotal: c.n_total, homesSampled: c.n, failuresSampled: c.k, activationPrice: c.activation, reworkPrice: c.rework, confidence: c.confidence });
    expect(quote.priceExpectedCents).toBe(expected.priceExpected);
    expect(quote.priceUpperCents).toBe(expected.priceUpper);
    expect(quote.priceUpperCents).toBeGreaterThan(quote.priceExpectedCents);
    expect(quote.createdByName).toBeTruthy();
    expect(quote.method).toMatch(/Beta\(1, 1\)/);
  });

  it('can borrow strength: a pooled quote starts from the prior fitted to the builder’s other communities', async () => {
    const res = await estimator.post('/api/quotes', { communityId: community.id, pooled: true });
    expect(res.status).toBe(201);
    const pooled = res.body.quote as QuoteDto;
    expect(pooled.pooled).toBe(true);
    expect([pooled.priorAlpha, pooled.priorBeta]).not.toEqual([1, 1]);
    expect(pooled.method).toMatch(/fitted from similar communities/);
  });

  it('is approved by a manager only, and only a draft can be approved', async () => {
    expect((await estimator.post(`/api/quotes/${quote.id}/approve`)).status).toBe(403);
    const early = await estimator.post(`/api/quotes/${quote.id}/send`, {});
    expect(early.status).toBe(409);
    const res = await manager.post(`/api/quotes/${quote.id}/approve`);
    expect(res.status).toBe(200);
    expect(res.body.quote).toMatchObject({ status: 'approved', approvedByName: expect.any(String) });
    expect(res.body.quote.approvedAt).toBeTruthy();
    expect((await manager.post(`/api/quotes/${quote.id}/approve`)).status).toBe(409);
  });

  it('e-mails the approved quote: the SMTP fake receives it with the PDF, which names the community and the price range', async () => {
    const res = await estimator.post(`/api/quotes/${quote.id}/send`, {});
    expect(res.status).toBe(200);
    expect(res.body.quote).toMatchObject({ status: 'sent', recipientEmail: 'board@tamarack-hoa.test' });
    expect(res.body.quote.sentAt).toBeTruthy();

    const mail = await smtp.waitFor((m) => m.to.includes('board@tamarack-hoa.test'));
    expect(mail.subject).toContain(community.name);
    expect(mail.from).toContain('quotes@tarrowby-radon.test');
    expect(mail.attachments).toHaveLength(1);
    const [pdf] = mail.attachments;
    expect(pdf.contentType).toBe('application/pdf');
    expect(pdf.filename).toMatch(/\.pdf$/);
    expect(pdf.content.subarray(0, 5).toString('latin1')).toBe('%PDF-'); // ISO 32000-1 §7.5.2 file header
    const text = await pdfText(new Uint8Array(pdf.content));
    expect(text).toContain(community.name);
    expect(text).toContain(`${usd(quote.priceExpectedCents)} – ${usd(quote.priceUpperCents)}`);
    expect(text).toMatch(/electrical code/i);
    expect(text).toMatch(/backdraft/i);
    expect(text).toMatch(/certified radon professional/i);
    expect(text).toMatch(/local building, electrical and mechanical codes/i);
    expect(text).toContain('Sampled homes');
  });

  it('records the customer’s decision once, after sending', async () => {
    const res = await estimator.post(`/api/quotes/${quote.id}/decision`, { decision: 'accepted' });
    expect(res.status).toBe(200);
    expect(res.body.quote.status).toBe('accepted');
    expect(res.body.quote.decidedAt).toBeTruthy();
    expect((await estimator.post(`/api/quotes/${quote.id}/decision`, { decision: 'declined' })).status).toBe(409);
    const bad = await estimator.post(`/api/quotes/${quote.id}/decision`, { decision: 'maybe' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields[0].field).toBe('decision');
  });

  it('serves the PDF for download and lists the sent mail in the development outbox', async () => {
    const res = await fetch(`${app.url}/api/quotes/${quote.id}/pdf`, { headers: { Cookie: estimator.cookie } });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('application/pdf');
    expect(await pdfText(new Uint8Array(await res.arrayBuffer()))).toContain(community.name);
    const outbox = await manager.get('/api/mail/outbox');
    expect(outbox.status).toBe(200);
    expect(outbox.body.messages[0]).toMatchObject({ to: ['board@tamarack-hoa.test'], attachments: [{ contentType: 'application/pdf' }] });
  });

  it("e-mails a homeowner their own home's results, never to a do-not-contact home", async () => {
    const { rows } = await app.database.pool.query(
      `select id, number || ' ' || street as address from homes where company_id = $1 and sampled and not do_not_contact and last_post_bq_m3 is not null limit 1`,
      [companyId],
    );
    const res = await estimator.post(`/api/home-results/${rows[0].id}/email`, { recipientEmail: 'owner@example.test' });
    expect(res.status).toBe(200);
    const mail = await smtp.waitFor((m) => m.to.includes('owner@example.test'));
    expect(mail.subject).toContain(rows[0].address);
    expect(mail.text).toContain('post-mitigation radon test');
    expect(mail.text).toMatch(/certified radon professional/);

    const { rows: dnc } = await app.database.pool.query(`select id from homes where company_id = $1 and do_not_contact limit 1`, [companyId]);
    if (dnc[0]) {
      const refused = await estimator.post(`/api/home-results/${dnc[0].id}/email`, { recipientEmail: 'owner@example.test' });
      expect(refused.status).toBe(422);
    }
    const tech = new ApiClient(app.url);
    await tech.signIn(demoUser('technician'));
    expect((await tech.post(`/api/home-results/${rows[0].id}/email`, { recipientEmail: 'owner@example.test' })).status).toBe(403);
  });

  it("keeps quotes inside the company and refuses a quote for another company's community", async () => {
    const other = new ApiClient(app.url);
    await other.signIn(otherCompanyUser('admin'));
    expect((await other.get(`/api/quotes/${quote.id}`)).status).toBe(404);
    expect((await other.post('/api/quotes', { communityId: community.id })).status).toBe(404);
    expect((await other.get('/api/quotes')).body.quotes).toEqual([]);
    const sales = new ApiClient(app.url);
    await sales.signIn(demoUser('sales'));
    expect((await sales.get('/api/quotes')).status).toBe(403);
  });
});
