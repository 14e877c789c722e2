import type { QuoteStatus } from '@shared/schemas/quotes';

const dollars = new Intl.NumberFormat('en-US', { style: 'currency', currency: 'USD', maximumFractionDigits: 0, minimumFractionDigits: 0 });
/** Whole cents as whole dollars ("$123,456"), the same rounding the PDF uses. */
export const money = (cents: number) => dollars.format(Math.round(cents / 100));

export const STATUS_LABELS: Record<QuoteStatus, string> = {
  draft: 'Draft',
  approved: 'Approved',
  sent: 'Sent',
  accepted: 'Accepted',
  declined: 'Declined',
};

export const when = (iso: string | null) => (iso ? new Date(iso).toLocaleString('en-US', { dateStyle: 'medium', timeStyle: 'short' }) : '—');
