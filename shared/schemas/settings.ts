import { z } from 'zod';

/** Company settings; the action level defaults to EPA's 4 pCi/L = 148 Bq/m³ (A Citizen's Guide to Radon, 2016). */
export const SettingsDto = z.object({
  companyName: z.string(),
  actionLevelBqM3: z.number(),
  considerLevelBqM3: z.number(),
  radonUnit: z.enum(['pCi/L', 'Bq/m3']),
  activationPriceCents: z.number().int(),
  reworkPriceCents: z.number().int(),
  quoteConfidence: z.number(),
  pfeTargetPa: z.number(),
});
export type SettingsDto = z.infer<typeof SettingsDto>;

export const UpdateSettingsBody = z
  .object({
    companyName: z.string().trim().min(1).max(120),
    actionLevelBqM3: z.number().positive().max(10000),
    considerLevelBqM3: z.number().positive().max(10000),
    radonUnit: z.enum(['pCi/L', 'Bq/m3']),
    activationPriceCents: z.number().int().min(0).max(100_000_00),
    reworkPriceCents: z.number().int().min(0).max(100_000_00),
    quoteConfidence: z.number().min(0.5).max(0.995),
    pfeTargetPa: z.number().positive().max(100),
  })
  .partial()
  .refine((b) => Object.keys(b).length > 0, 'nothing to change');
