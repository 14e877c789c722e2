import { z } from 'zod';
import { patchSchema } from './common.js';

export const BuilderBody = z.object({
  name: z.string().trim().min(1).max(120),
  notes: z.string().max(4000).default(''),
});
export const UpdateBuilderBody = patchSchema(BuilderBody);

export const BuilderDto = z.object({ id: z.string(), name: z.string(), notes: z.string(), homeCount: z.number() });
export type BuilderDto = z.infer<typeof BuilderDto>;
