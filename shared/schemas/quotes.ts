import { z } from 'zod';

export const QUOTE_STATUSES = ['draft', 'approved', 'sent', 'accepted', 'declined'] as const;
export type QuoteStatus = (typeof QUOTE_STATUSES)[number];

export const QuoteBody = z.object({
  communityId: z.string().uuid(),
  /** Use the failure rate pooled with the builder's other communities as the prior (else uniform Beta(1, 1)). */
  pooled: z.boolean().default(false),
  recipientEmail: z.string().trim().email().max(254).nullable().default(null),
});

export const SendQuoteBody = z.object({ recipientEmail: z.string().trim().email().max(254).optional() });
export const QuoteDecisionBody = z.object({ decision: z.enum(['accepted', 'declined']) });
export const QuoteListQuery = z.object({ communityId: z.string().uuid().optional(), status: z.enum(QUOTE_STATUSES).optional() });

export const HomeResultsMailBody = z.object({ recipientEmail: z.string().trim().email().max(254) });

export const QuoteDto = z.object({
  id: z.string(),
  communityId: z.string(),
  communityName: z.string(),
  status: z.enum(QUOTE_STATUSES),
  homesTotal: z.number().int(),
  homesSampled: z.number().int(),
  failuresSampled: z.number().int(),
  priorAlpha: z.number(),
  priorBeta: z.number(),
  pooled: z.boolean(),
  confidence: z.number(),
  activationPriceCents: z.number().int(),
  reworkPriceCents: z.number().int(),
  expectedReworks: z.number(),
  upperReworks: z.number().int(),
  priceExpectedCents: z.number().int(),
  priceUpperCents: z.number().int(),
  perHomeExpectedCents: z.number().int(),
  perHomeUpperCents: z.number().int(),
  method: z.string(),
  recipientEmail: z.string().nullable(),
  createdAt: z.string(),
  createdByName: z.string().nullable(),
  approvedAt: z.string().nullable(),
  approvedByName: z.string().nullable(),
  sentAt: z.string().nullable(),
  decidedAt: z.string().nullable(),
});
export type QuoteDto = z.infer<typeof QuoteDto>;

export const SentMailDto = z.object({
  messageId: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  sentAt: z.string(),
  attachments: z.array(z.object({ filename: z.string(), contentType: z.string(), bytes: z.number().int() })),
});
export type SentMailDto = z.infer<typeof SentMailDto>;
