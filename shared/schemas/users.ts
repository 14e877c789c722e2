import { z } from 'zod';
import { ROLES } from './enums.js';

export const CreateUserBody = z.object({
  email: z.string().trim().toLowerCase().email(),
  name: z.string().trim().min(1).max(120),
  role: z.enum(ROLES),
  password: z.string().min(10, 'at least 10 characters').max(200),
});
export const UpdateUserBody = z
  .object({ name: z.string().trim().min(1).max(120), role: z.enum(ROLES), active: z.boolean() })
  .partial()
  .refine((b) => Object.keys(b).length > 0, 'nothing to change');

export const UserDto = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  role: z.enum(ROLES),
  active: z.boolean(),
  createdAt: z.string(),
});
export type UserDto = z.infer<typeof UserDto>;
