import { z } from 'zod';

/** Client configuration from Vite's import.meta.env, parsed once. */
const ClientEnv = z.object({
  MODE: z.string(),
  DEV: z.boolean(),
});

export const clientEnv = ClientEnv.parse(import.meta.env);
