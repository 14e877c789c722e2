// The field-visit contract: fans, visits, radon tests and attachments, as the API accepts and answers
// them. Pressures are entered in the unit shown beside the input and stored in Pa; radon results in
// Bq/m³ (see shared/domain/units.ts).
import { z } from 'zod';
import { REWORK_REASONS, SUB_SLAB_MATERIALS, TEST_DEVICES, TEST_KINDS, VISIT_STATUSES } from './enums.js';

/** Largest photo or lab report the API accepts (bytes). */
export const MAX_ATTACHMENT_BYTES = 15 * 1024 * 1024;
export const PHOTO_CONTENT_TYPES = ['image/jpeg', 'image/png', 'image/webp'] as const;
export const LAB_REPORT_CONTENT_TYPES = ['application/pdf'] as const;
export const ATTACHMENT_KINDS = ['photo', 'lab_report'] as const;
export const PHOTO_SUBJECTS = ['manometer', 'fan', 'suction_point', 'other'] as const;
export const PRESSURE_UNITS = ['Pa', 'in_wc'] as const;

// ── Fans ──────────────────────────────────────────────────────────────────────────────────────────

export const FanCurvePointSchema = z.object({
  flowCfm: z.number().min(0, 'must be 0 or more').max(2000, 'must be 2,000 CFM or less'),
  staticInWc: z.number().min(0, 'must be 0 or more').max(10, 'must be 10 in. WC or less'),
});

/** The maker's curve as points; static pressure must not rise with flow. */
export const FanCurvePoints = z
  .array(FanCurvePointSchema)
  .min(2, 'needs at least two points')
  .max(30)
  .superRefine((points, ctx) => {
    const sorted = [...points].sort((a, b) => a.flowCfm - b.flowCfm);
    for (let i = 1; i < sorted.length; i++) {
      if (sorted[i].flowCfm === sorted[i - 1].flowCfm) ctx.addIssue({ code: 'custom', message: 'flows must be distinct' });
      else if (sorted[i].staticInWc > sorted[i - 1].staticInWc) ctx.addIssue({ code: 'custom', message: 'static pressure must not rise with flow' });
    }
    if (points.length > 0 && Math.max(...points.map((p) => p.staticInWc)) <= 0) {
      ctx.addIssue({ code: 'custom', message: 'needs a static pressure above 0 (the fan\'s maximum, at no flow)' });
    }
  });

export const FanBody = z.object({
  name: z.string().trim().min(1).max(120),
  curve: FanCurvePoints,
});

export const FanDto = z.object({
  id: z.string().uuid(),
  name: z.string(),
  maxStaticInWc: z.number(),
  curve: z.array(FanCurvePointSchema),
});
export type FanDto = z.infer<typeof FanDto>;

export const HomeIdParams = z.object({ homeId: z.string().uuid() });
export const AttachmentUploadParams = z.object({ homeId: z.string().uuid(), attachmentId: z.string().uuid() });

/** An attachment as a visit or test lists it; the bytes are at GET /api/attachments/:id (and /thumbnail for photos). */
export const AttachmentRef = z.object({ id: z.string().uuid(), kind: z.enum(ATTACHMENT_KINDS), subject: z.string().nullable(), contentType: z.string() });

// ── Visits ────────────────────────────────────────────────────────────────────────────────────────

export const PressureFieldHole = z.object({
  distanceFt: z.number().min(0, 'must be 0 or more').max(200),
  differential: z.number().min(0, 'must be 0 or more (enter the vacuum as a positive number)').max(2500),
  unit: z.enum(PRESSURE_UNITS),
});

/**
 * A visit as the technician's device sends it. `id` is generated on the device, so sending the same
 * visit again (a retry after a lost connection) stores it once.
 */
export const VisitBody = z
  .object({
    id: z.string().uuid(),
    visitedOn: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'must be a date (YYYY-MM-DD)'),
    status: z.enum(VISIT_STATUSES),
    fanId: z.string().uuid().nullable().default(null),
    fanLocation: z.string().trim().max(120).default(''),
    fanActivatedAt: z.string().datetime({ offset: true }).nullable().default(null),
    /** Manometer vacuum as read, in. WC (a positive magnitude). */
    vacuumInWc: z.number().min(0, 'must be 0 or more').max(10, 'is above any in-line fan (10 in. WC)').nullable().default(null),
    laterVacuumInWc: z.number().min(0, 'must be 0 or more').max(10).nullable().default(null),
    pipeSizeIn: z.union([z.literal(3), z.literal(4)]).nullable().default(null),
    pipeLengthFt: z.number().min(0, 'must be 0 or more').max(200).nullable().default(null),
    elbows: z.number().int().min(0, 'must be 0 or more').max(20).nullable().default(null),
    pipeEntry: z.string().trim().max(200).default(''),
    subSlabMaterial: z.enum(SUB_SLAB_MATERIALS).default('unknown'),
    pressureField: z.array(PressureFieldHole).max(30).default([]),
    reworkNeeded: z.boolean().default(false),
    reworkDone: z.boolean().default(false),
    reworkReasons: z.array(z.enum(REWORK_REASONS)).max(REWORK_REASONS.length).default([]),
    notes: z.string().max(4000).default(''),
  })
  .superRefine((v, ctx) => {
    if (v.reworkReasons.includes('other') && v.notes.trim() === '') {
      ctx.addIssue({ code: 'custom', path: ['notes'], message: 'describe the "other" rework in the notes' });
    }
    if (v.status === 'completed' && v.vacuumInWc === null && v.fanId !== null) {
      ctx.addIssue({ code: 'custom', path: ['vacuumInWc'], message: 'is required when a fan was installed' });
    }
  });
export type VisitBody = z.infer<typeof VisitBody>;

export const VisitDto = z.object({
  id: z.string().uuid(),
  homeId: z.string().uuid(),
  visitedOn: z.string(),
  status: z.enum(VISIT_STATUSES),
  technicianName: z.string().nullable(),
  fanId: z.string().uuid().nullable(),
  fanName: z.string().nullable(),
  fanLocation: z.string(),
  fanActivatedAt: z.string().nullable(),
  vacuumPa: z.number().nullable(),
  laterVacuumPa: z.number().nullable(),
  pipeSizeIn: z.number().nullable(),
  pipeLengthFt: z.number().nullable(),
  elbows: z.number().nullable(),
  pipeEntry: z.string(),
  subSlabMaterial: z.enum(SUB_SLAB_MATERIALS),
  /** Stored in Pa. */
  pressureField: z.array(z.object({ distanceFt: z.number(), differentialPa: z.number() })),
  reworkNeeded: z.boolean(),
  reworkDone: z.boolean(),
  reworkReasons: z.array(z.string()),
  notes: z.string(),
  attachments: z.array(AttachmentRef),
});
export type VisitDto = z.infer<typeof VisitDto>;

// ── Radon tests ───────────────────────────────────────────────────────────────────────────────────

export const RadonTestBody = z
  .object({
    /** Generated on the device, like a visit's id. */
    id: z.string().uuid(),
    visitId: z.string().uuid().nullable().default(null),
    kind: z.enum(TEST_KINDS),
    device: z.enum(TEST_DEVICES),
    startedAt: z.string().datetime({ offset: true }),
    endedAt: z.string().datetime({ offset: true }),
    result: z.number().min(0, 'must be 0 or more').max(1_000_000),
    unit: z.enum(['pCi/L', 'Bq/m3']),
    /** Devices placed side by side share a group label; their results are averaged. */
    sideBySideGroup: z.string().trim().max(40).nullable().default(null),
  })
  .superRefine((t, ctx) => {
    if (Date.parse(t.endedAt) <= Date.parse(t.startedAt)) ctx.addIssue({ code: 'custom', path: ['endedAt'], message: 'must be after the start' });
  });
export type RadonTestBody = z.infer<typeof RadonTestBody>;

export const RadonTestDto = z.object({
  id: z.string().uuid(),
  homeId: z.string().uuid(),
  visitId: z.string().uuid().nullable(),
  kind: z.enum(TEST_KINDS),
  device: z.enum(TEST_DEVICES),
  startedAt: z.string(),
  endedAt: z.string(),
  resultBqM3: z.number(),
  sideBySideGroup: z.string().nullable(),
  /** Practice warnings (short test, started too soon after activation); never a reason to refuse. */
  warnings: z.array(z.object({ code: z.string(), message: z.string(), source: z.string().optional() })),
  /** Lab reports attached to this test. */
  attachments: z.array(AttachmentRef).optional(),
});
export type RadonTestDto = z.infer<typeof RadonTestDto>;

// ── Attachments ───────────────────────────────────────────────────────────────────────────────────

/**
 * Query of PUT /api/homes/:homeId/attachments/:attachmentId. The request body is the file itself
 * (Content-Type = its type); the id is generated on the device so a retried upload is stored once.
 */
export const AttachmentUploadQuery = z
  .object({
    kind: z.enum(ATTACHMENT_KINDS),
    subject: z.enum(PHOTO_SUBJECTS).optional(),
    visitId: z.string().uuid().optional(),
    radonTestId: z.string().uuid().optional(),
    /** The original file name, kept for downloads. */
    name: z.string().trim().max(255).default(''),
  })
  .superRefine((q, ctx) => {
    if (q.kind !== 'photo' && q.subject !== undefined) ctx.addIssue({ code: 'custom', path: ['subject'], message: 'only photos have a subject' });
  });
export type AttachmentUploadQuery = z.infer<typeof AttachmentUploadQuery>;

export const AttachmentDto = z.object({
  id: z.string().uuid(),
  kind: z.enum(ATTACHMENT_KINDS),
  subject: z.enum(PHOTO_SUBJECTS).nullable(),
  contentType: z.string(),
  byteSize: z.number().int(),
});
export type AttachmentDto = z.infer<typeof AttachmentDto>;
