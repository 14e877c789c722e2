import PDFDocument from 'pdfkit';
import { createRequire } from 'node:module';
import { formatRadon, paToInWc, type RadonDisplayUnit } from '../../../shared/domain/units.js';
import { formatAddress } from '../../../shared/domain/address.js';
import { wilsonInterval } from '../../../shared/domain/statistics.js';
import { QUOTE_CAUTIONS, REWORK_WORDS, formatCents } from './quote-words.js';

const require = createRequire(import.meta.url);
const FONT_REGULAR = require.resolve('@fontsource/ibm-plex-sans/files/ibm-plex-sans-latin-400-normal.woff');
const FONT_SEMIBOLD = require.resolve('@fontsource/ibm-plex-sans/files/ibm-plex-sans-latin-600-normal.woff');

// The product's own palette (DESIGN.md): ink on white paper, one teal accent, Okabe–Ito data colours.
const INK = '#1E2630';
const MUTED = '#5B6573';
const RULE = '#DDD6CA';
const ACCENT = '#0F6E74';
const GOOD = '#009E73';
const BAD = '#D55E00';
const IDLE = '#8A929C';
const PAPER = '#F7F4EE';

export interface QuotePdfHome {
  number: string;
  street: string;
  unit: string | null;
  yearBuilt: number | null;
  lon: number;
  lat: number;
  sampled: boolean;
  failed: boolean;
  lastVacuumPa: number | null;
  lastPostBqM3: number | null;
  reworkReasons: string[];
}

export interface QuotePdfInput {
  companyName: string;
  communityName: string;
  jurisdiction: string;
  boundary: { type: 'MultiPolygon'; coordinates: number[][][][] } | null;
  homes: QuotePdfHome[];
  status: string;
  quoteId: string;
  createdAt: Date;
  approvedByName: string | null;
  radonUnit: RadonDisplayUnit;
  actionLevelBqM3: number;
  homesTotal: number;
  homesSampled: number;
  failuresSampled: number;
  confidence: number;
  activationPriceCents: number;
  reworkPriceCents: number;
  expectedReworks: number;
  upperReworks: number;
  priceExpectedCents: number;
  priceUpperCents: number;
  perHomeUpperCents: number;
  method: string;
}

/** Sampled homes listed in the table; the rest are summarised in a line below it. */
const TABLE_LIMIT = 24;

/** The price range exactly as the quote prints it (the tests look for this string). */
export const priceRange = (expectedCents: number, upperCents: number) => `${formatCents(expectedCents)} – ${formatCents(upperCents)}`;

function whatItShowed(h: QuotePdfHome, actionLevelBqM3: number, unit: RadonDisplayUnit): string {
  const reasons = h.reworkReasons.map((r) => REWORK_WORDS[r] ?? r);
  if (h.failed && reasons.length) return `Needed rework: ${reasons.join(', ')}`;
  if (h.failed && h.lastPostBqM3 != null && h.lastPostBqM3 >= actionLevelBqM3) return `Still at or above the action level (${formatRadon(h.lastPostBqM3, unit)})`;
  if (h.failed) return 'Needed rework';
  if (h.lastPostBqM3 != null) return 'The fan alone brought it below the action level';
  return 'Activated; post-mitigation test pending';
}

/** Draws the community outline and its homes, fitted into a box (equirectangular, scaled by cos φ). */
function drawMap(doc: PDFKit.PDFDocument, input: QuotePdfInput, x: number, y: number, w: number, h: number) {
  doc.save().rect(x, y, w, h).fillAndStroke(PAPER, RULE).restore();
  const points: [number, number][] = input.homes.map((home) => [home.lon, home.lat]);
  for (const poly of input.boundary?.coordinates ?? []) for (const ring of poly) for (const p of ring) points.push([p[0], p[1]]);
  if (points.length === 0) return;
  const lat0 = points.reduce((s, p) => s + p[1], 0) / points.length;
  const k = Math.cos((lat0 * Math.PI) / 180);
  const xs = points.map((p) => p[0] * k);
  const ys = points.map((p) => p[1]);
  const [minX, maxX, minY, maxY] = [Math.min(...xs), Math.max(...xs), Math.min(...ys), Math.max(...ys)];
  const pad = 10;
  const scale = Math.min((w - 2 * pad) / Math.max(maxX - minX, 1e-9), (h - 2 * pad) / Math.max(maxY - minY, 1e-9));
  const offX = x + (w - (maxX - minX) * scale) / 2;
  const offY = y + (h - (maxY - minY) * scale) / 2;
  const project = (lon: number, lat: number): [number, number] => [offX + (lon * k - minX) * scale, offY + (maxY - lat) * scale];

  for (const poly of input.boundary?.coordinates ?? []) {
    for (const ring of poly) {
      ring.forEach((p, i) => {
        const [px, py] = project(p[0], p[1]);
        if (i === 0) doc.moveTo(px, py);
        else doc.lineTo(px, py);
      });
      doc.closePath();
    }
    doc.save().lineWidth(1).dash(3, { space: 2 }).strokeColor(ACCENT).stroke().undash().restore();
  }
  // Unsampled first, so the sampled homes draw on top; shape as well as colour tells them apart.
  for (const home of input.homes.filter((hm) => !hm.sampled)) {
    const [px, py] = project(home.lon, home.lat);
    doc.save().lineWidth(0.6).circle(px, py, 1.6).strokeColor(IDLE).stroke().restore();
  }
  for (const home of input.homes.filter((hm) => hm.sampled)) {
    const [px, py] = project(home.lon, home.lat);
    if (home.failed) {
      doc.save().moveTo(px, py - 4).lineTo(px + 3.8, py + 2.8).lineTo(px - 3.8, py + 2.8).closePath().fillColor(BAD).fill().restore();
    } else {
      doc.save().circle(px, py, 3).fillColor(GOOD).fill().restore();
    }
  }
}

function legend(doc: PDFKit.PDFDocument, x: number, y: number) {
  doc.font('semibold').fontSize(7.5).fillColor(MUTED);
  doc.save().circle(x + 3, y + 4, 3).fillColor(GOOD).fill().restore();
  doc.text('Sampled, fan alone enough', x + 10, y, { lineBreak: false });
  doc.save().moveTo(x + 3 + 120, y + 0.5).lineTo(x + 6.8 + 120, y + 7.3).lineTo(x - 0.8 + 120, y + 7.3).closePath().fillColor(BAD).fill().restore();
  doc.text('Sampled, needed rework', x + 130, y, { lineBreak: false });
  doc.save().lineWidth(0.6).circle(x + 3, y + 16, 1.6).strokeColor(IDLE).stroke().restore();
  doc.text('Not yet sampled', x + 10, y + 12, { lineBreak: false });
}

function heading(doc: PDFKit.PDFDocument, text: string) {
  doc.moveDown(0.8);
  doc.font('semibold').fontSize(12).fillColor(ACCENT).text(text, doc.page.margins.left);
  doc.moveDown(0.2);
}

/**
 * The community quote as a PDF: who it is for, what the sampled homes showed (in words, a table
 * and a drawn map), the price range and what it covers, how it was worked out, and the usual
 * cautions with deference to local codes and licensed practice.
 */
export function renderQuotePdf(input: QuotePdfInput): Promise<Buffer> {
  const doc = new PDFDocument({
    size: 'LETTER',
    margins: { top: 54, bottom: 60, left: 54, right: 54 },
    bufferPages: true,
    info: { Title: `Community quote: ${input.communityName}`, Author: input.companyName, Subject: 'Radon system activation quote' },
  });
  doc.registerFont('regular', FONT_REGULAR);
  doc.registerFont('semibold', FONT_SEMIBOLD);
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });

  const left = doc.page.margins.left;
  const width = doc.page.width - left - doc.page.margins.right;
  const unit = input.radonUnit;
  const unsampled = input.homesTotal - input.homesSampled;

  // Header
  doc.font('semibold').fontSize(11).fillColor(INK).text(input.companyName, left, 40, { width: width / 2 });
  doc.font('regular').fontSize(9).fillColor(MUTED).text(`Community quote · ${input.createdAt.toISOString().slice(0, 10)} · ref. ${input.quoteId.slice(0, 8)}`, left + width / 2, 42, { width: width / 2, align: 'right' });
  doc.moveTo(left, 60).lineTo(left + width, 60).lineWidth(1.5).strokeColor(ACCENT).stroke();
  doc.font('semibold').fontSize(22).fillColor(INK).text(input.communityName, left, 74);
  doc.font('regular').fontSize(10).fillColor(MUTED).text(
    [`${input.homesTotal} homes`, input.jurisdiction, input.approvedByName ? `approved by ${input.approvedByName}` : null].filter(Boolean).join(' · '),
  );
  if (input.status === 'draft') {
    doc.moveDown(0.3).font('semibold').fontSize(10).fillColor(BAD).text('DRAFT: not yet approved, not an offer.');
  }

  // What we found
  heading(doc, 'What the sampled homes showed');
  const wilson = wilsonInterval(input.failuresSampled, input.homesSampled);
  const pct = (x: number) => `${Math.round(x * 100)} %`;
  const found =
    input.homesSampled === 0
      ? `No home in ${input.communityName} has been activated yet, so this quote rests on the prior stated below rather than on this community's own homes.`
      : `We activated the passive radon system in ${input.homesSampled} of the ${input.homesTotal} homes. ` +
        `In ${input.failuresSampled} of them the fan alone did not bring the home below the action level of ${formatRadon(input.actionLevelBqM3, unit)}, or the system needed rework. ` +
        `With this few homes the true share could lie anywhere from about ${pct(wilson.lower)} to ${pct(wilson.upper)} (Wilson 95 % interval), which is why the price below is a range.`;
  doc.font('regular').fontSize(10).fillColor(INK).text(found, { width });

  const mapTop = doc.y + 10;
  const mapW = 250;
  const mapH = 170;
  drawMap(doc, input, left, mapTop, mapW, mapH);
  legend(doc, left, mapTop + mapH + 6);
  // Key figures beside the map.
  const fx = left + mapW + 20;
  const figures: [string, string][] = [
    ['Homes in the community', String(input.homesTotal)],
    ['Homes sampled', String(input.homesSampled)],
    ['Needed rework or stayed above the level', String(input.failuresSampled)],
    ['Homes not yet sampled', String(unsampled)],
    ['Expected reworks among them', input.expectedReworks.toFixed(1)],
    [`Reworks not exceeded with ${Math.round(input.confidence * 100)} % confidence`, String(input.upperReworks)],
  ];
  let fy = mapTop + 4;
  for (const [label, value] of figures) {
    doc.font('regular').fontSize(9).fillColor(MUTED).text(label, fx, fy, { width: width - mapW - 80 });
    doc.font('semibold').fontSize(11).fillColor(INK).text(value, left + width - 56, fy - 1, { width: 56, align: 'right' });
    fy += 26;
  }
  doc.y = mapTop + mapH + 30;
  doc.x = left;

  // Sampled homes table
  const sampled = input.homes.filter((h) => h.sampled);
  if (sampled.length) {
    heading(doc, 'Sampled homes');
    const cols = [
      { title: 'Address', w: 150 },
      { title: 'Built', w: 38 },
      { title: 'Manometer', w: 66 },
      { title: 'Post-test', w: 62 },
      { title: 'What it showed', w: width - 150 - 38 - 66 - 62 },
    ];
    const row = (cells: string[], bold: boolean) => {
      if (doc.y > doc.page.height - doc.page.margins.bottom - 24) {
        doc.addPage();
        // The header row again at the top of the new page.
        if (!bold) row(cols.map((c) => c.title), true);
      }
      const top = doc.y;
      let x = left;
      let bottom = top;
      cells.forEach((c, i) => {
        doc.font(bold ? 'semibold' : 'regular').fontSize(8.5).fillColor(bold ? MUTED : INK).text(c, x, top, { width: cols[i].w - 6 });
        bottom = Math.max(bottom, doc.y);
        x += cols[i].w;
      });
      doc.moveTo(left, bottom + 2).lineTo(left + width, bottom + 2).lineWidth(0.5).strokeColor(RULE).stroke();
      doc.y = bottom + 5;
    };
    row(cols.map((c) => c.title), true);
    for (const h of sampled.slice(0, TABLE_LIMIT)) {
      row(
        [
          formatAddress(h),
          h.yearBuilt ? String(h.yearBuilt) : '—',
          h.lastVacuumPa != null ? `${paToInWc(h.lastVacuumPa).toFixed(2)} in. WC` : '—',
          h.lastPostBqM3 != null ? formatRadon(h.lastPostBqM3, unit) : '—',
          whatItShowed(h, input.actionLevelBqM3, unit),
        ],
        false,
      );
    }
    if (sampled.length > TABLE_LIMIT) doc.font('regular').fontSize(8.5).fillColor(MUTED).text(`…and ${sampled.length - TABLE_LIMIT} more sampled homes.`, left);
    doc.x = left;
  }

  // Price
  heading(doc, 'Price for the whole community');
  doc.font('semibold').fontSize(20).fillColor(INK).text(priceRange(input.priceExpectedCents, input.priceUpperCents), left, doc.y, { width });
  doc.font('regular').fontSize(9).fillColor(MUTED).text(`Expected total – total if rework reaches the ${Math.round(input.confidence * 100)} % upper bound`);
  doc.moveDown(0.4);
  const lines = [
    `Activation of all ${input.homesTotal} homes at ${formatCents(input.activationPriceCents)} each: ${formatCents(input.activationPriceCents * input.homesTotal)}.`,
    `Rework at ${formatCents(input.reworkPriceCents)} a home: about ${input.expectedReworks.toFixed(1)} of the ${unsampled} homes not yet sampled are expected to need it; with ${Math.round(input.confidence * 100)} % confidence no more than ${input.upperReworks} will.`,
    `Per-home options: ${formatCents(input.activationPriceCents)} activation with rework billed at ${formatCents(input.reworkPriceCents)} only where it is needed; or ${formatCents(input.perHomeUpperCents)} a home, all-inclusive, for every home in the community.`,
  ];
  for (const l of lines) doc.font('regular').fontSize(10).fillColor(INK).text(`•  ${l}`, left, doc.y, { width, indent: 0 });
  doc.moveDown(0.4);
  doc.font('semibold').fontSize(10).fillColor(INK).text('What it covers');
  doc.font('regular').fontSize(10).fillColor(INK).text(
    'Activating the passive system the builder installed: an in-line fan on the existing vent pipe (usually in the attic or garage attic), connection to the junction box the builder left, a system gauge and labels, a check of the pressure field under the slab, and a post-mitigation radon test. Rework, where a home needs it, means an added suction point, sealing of openings and slab joints, re-routed pipe or a larger fan. Electrical work beyond the existing junction box is quoted separately.',
    { width },
  );

  heading(doc, 'How the range was worked out');
  doc.font('regular').fontSize(9).fillColor(MUTED).text(input.method, { width });

  heading(doc, 'Please note');
  for (const c of QUOTE_CAUTIONS) doc.font('regular').fontSize(9).fillColor(INK).text(`•  ${c}`, left, doc.y, { width });

  // Footer on every page.
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i += 1) {
    doc.switchToPage(i);
    // Writing below the bottom margin would start a new page: lift the margin for the footer.
    doc.page.margins.bottom = 0;
    const bottom = doc.page.height - 36;
    doc.font('regular').fontSize(8).fillColor(MUTED).text(`${input.companyName} · ${input.communityName} · page ${i + 1} of ${range.count}`, left, bottom, { width, align: 'center', lineBreak: false });
  }
  doc.end();
  return done;
}
