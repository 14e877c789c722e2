import type { Outcome } from '@shared/schemas/enums';

/**
 * Map symbols for home outcomes, drawn once on a canvas and registered as map images.
 * Colour and shape both differ (DESIGN.md; Okabe & Ito 2008 colour-blind-safe set).
 */
const INK = '#1E2630';
const IDLE = '#8A929C';
const GOOD = '#009E73';
const BAD = '#D55E00';
const PLANNED = '#0072B2';
const PAPER = '#F7F4EE';

type Draw = (ctx: CanvasRenderingContext2D, s: number) => void;

const circle = (ctx: CanvasRenderingContext2D, s: number, r: number) => {
  ctx.beginPath();
  ctx.arc(s / 2, s / 2, r, 0, Math.PI * 2);
};

const DRAW: Record<Outcome | 'planned', Draw> = {
  not_visited: (ctx, s) => {
    circle(ctx, s, s * 0.22);
    ctx.fillStyle = PAPER;
    ctx.fill();
    ctx.lineWidth = s * 0.09;
    ctx.strokeStyle = IDLE;
    ctx.stroke();
  },
  planned: (ctx, s) => {
    circle(ctx, s, s * 0.2);
    ctx.lineWidth = s * 0.09;
    ctx.strokeStyle = PLANNED;
    ctx.stroke();
    ctx.setLineDash([s * 0.1, s * 0.07]);
    circle(ctx, s, s * 0.4);
    ctx.stroke();
    ctx.setLineDash([]);
  },
  awaiting_test: (ctx, s) => {
    circle(ctx, s, s * 0.3);
    ctx.fillStyle = PAPER;
    ctx.fill();
    ctx.lineWidth = s * 0.12;
    ctx.strokeStyle = GOOD;
    ctx.stroke();
  },
  below_action_level: (ctx, s) => {
    circle(ctx, s, s * 0.34);
    ctx.fillStyle = GOOD;
    ctx.fill();
    ctx.lineWidth = s * 0.04;
    ctx.strokeStyle = PAPER;
    ctx.stroke();
  },
  needs_rework: (ctx, s) => {
    ctx.beginPath();
    ctx.moveTo(s / 2, s * 0.08);
    ctx.lineTo(s * 0.94, s * 0.88);
    ctx.lineTo(s * 0.06, s * 0.88);
    ctx.closePath();
    ctx.fillStyle = BAD;
    ctx.fill();
    ctx.lineWidth = s * 0.04;
    ctx.strokeStyle = PAPER;
    ctx.stroke();
  },
  reworked_below: (ctx, s) => {
    circle(ctx, s, s * 0.32);
    ctx.fillStyle = GOOD;
    ctx.fill();
    ctx.lineWidth = s * 0.12;
    ctx.strokeStyle = INK;
    ctx.stroke();
  },
  declined: (ctx, s) => {
    ctx.fillStyle = PAPER;
    ctx.fillRect(s * 0.28, s * 0.28, s * 0.44, s * 0.44);
    ctx.lineWidth = s * 0.09;
    ctx.strokeStyle = IDLE;
    ctx.strokeRect(s * 0.28, s * 0.28, s * 0.44, s * 0.44);
  },
};

export const ICON_PIXEL_RATIO = 2;
const SIZE = 20 * ICON_PIXEL_RATIO;

export const iconName = (key: Outcome | 'planned') => `outcome-${key}`;

/** Renders every symbol to ImageData for map.addImage (pixelRatio 2 for crisp phones). */
export function renderOutcomeIcons(): { name: string; image: ImageData }[] {
  return (Object.keys(DRAW) as (Outcome | 'planned')[]).map((key) => {
    const canvas = document.createElement('canvas');
    canvas.width = canvas.height = SIZE;
    const ctx = canvas.getContext('2d')!;
    DRAW[key](ctx, SIZE);
    return { name: iconName(key), image: ctx.getImageData(0, 0, SIZE, SIZE) };
  });
}

/** The same symbol as an SVG data URL, for the legend. */
export function iconDataUrl(key: Outcome | 'planned'): string {
  const canvas = document.createElement('canvas');
  canvas.width = canvas.height = SIZE;
  DRAW[key](canvas.getContext('2d')!, SIZE);
  return canvas.toDataURL();
}
