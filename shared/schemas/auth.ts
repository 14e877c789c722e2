import { z } from 'zod';
import { ROLES } from './enums.js';

export const SignInBody = z.object({
  email: z.string().trim().toLowerCase().email(),
  password: z.string().min(1).max(200),
});

export const SessionUser = z.object({
  id: z.string().uuid(),
  email: z.string(),
  name: z.string(),
  role: z.enum(ROLES),
  companyId: z.string().uuid(),
  companyName: z.string(),
});
export type SessionUser = z.infer<typeof SessionUser>;

export const SessionResponse = z.object({ user: SessionUser.nullable(), csrfToken: z.string().nullable() });
export type SessionResponse = z.infer<typeof SessionResponse>;
