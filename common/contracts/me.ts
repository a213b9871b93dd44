import { z } from 'zod';

export const unitSystems = ['metric', 'us'] as const;
export type UnitSystem = (typeof unitSystems)[number];

export const meSchema = z.object({
  id: z.string(),
  name: z.string(),
  email: z.string(),
  emailVerified: z.boolean(),
  unitSystem: z.enum(unitSystems),
  isAdmin: z.boolean(),
});
export type Me = z.infer<typeof meSchema>;

export const updateMeBody = z.object({
  name: z
    .string()
    .trim()
    .min(1, 'Enter your name.')
    .max(120, 'Use at most 120 characters.')
    .optional(),
  unitSystem: z.enum(unitSystems).optional(),
});
export type UpdateMeBody = z.infer<typeof updateMeBody>;

/* GET /api/session */
export const sessionSchema = z.object({ user: meSchema.nullable() });
