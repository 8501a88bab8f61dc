import { z } from 'zod';
import { idSchema } from './common.schema';
import { isCommonPassword } from './common-passwords';

export const ROLES = ['admin', 'agronomist', 'farmer', 'consultant'] as const;
export const roleSchema = z.enum(ROLES);
export type Role = z.infer<typeof roleSchema>;

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Admin',
  agronomist: 'Agronomist',
  farmer: 'Farmer',
  consultant: 'Consultant',
};

export const emailSchema = z
  .string({ message: 'E-mail is required' })
  .trim()
  .toLowerCase()
  .max(254, 'E-mail is too long')
  .pipe(z.email({ message: 'Not a valid e-mail address' }));

/**
 * A new password: 8 to 128 characters, no composition rules, not one of the most common passwords,
 * never trimmed or truncated (OWASP ASVS 5.0 6.2.1, 6.2.4, 6.2.8, 6.2.9).
 */
export const newPasswordSchema = z
  .string({ message: 'Password is required' })
  .min(8, 'Use at least 8 characters')
  .max(128, 'Use at most 128 characters')
  .refine((p) => !isCommonPassword(p), 'This password is too common: choose another');

export const signInSchema = z.object({
  email: emailSchema,
  // Checked exactly as typed: no trim.
  password: z.string({ message: 'Password is required' }).min(1, 'Password is required').max(1024),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const changePasswordSchema = z.object({
  currentPassword: z.string().min(1, 'Current password is required').max(1024),
  newPassword: newPasswordSchema,
});

export const requestResetSchema = z.object({ email: emailSchema });

export const tokenPasswordSchema = z.object({
  token: z.string().min(20, 'The link is incomplete').max(200),
  password: newPasswordSchema,
});

export const acceptInvitationSchema = tokenPasswordSchema.extend({
  name: z.string().trim().min(1, 'Name is required').max(120).optional(),
});

export const unitSystemSchema = z.enum(['imperial', 'metric']);

export const preferencesSchema = z.object({
  unitSystem: unitSystemSchema,
});

export const meSchema = z.object({
  id: idSchema,
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  workspace: z.object({ id: idSchema, name: z.string() }),
  growerId: idSchema.nullable(),
  unitSystem: unitSystemSchema,
});
export type Me = z.infer<typeof meSchema>;

/** GET /api/auth/session: who is signed in, or null. */
export const sessionSchema = z.object({ me: meSchema.nullable() });

/** GET /api/auth/invitation/:token. */
export const invitationSchema = z.object({ email: z.string(), name: z.string(), workspaceName: z.string() });
export type Invitation = z.infer<typeof invitationSchema>;
