import { z } from 'zod';
import { idSchema, nameText } from './common.schema';
import { emailSchema, roleSchema } from './auth.schema';

export const USER_STATUSES = ['invited', 'active', 'disabled'] as const;
export const userStatusSchema = z.enum(USER_STATUSES);

/** An admin invites a person with one role; a farmer belongs to one grower, a consultant reads several. */
const assignment = {
  growerId: idSchema.nullable().optional(),
  growerIds: z.array(idSchema).max(500).optional(),
};

function checkAssignment(
  u: { role: z.infer<typeof roleSchema>; growerId?: string | null },
  ctx: z.RefinementCtx,
) {
  if (u.role === 'farmer' && !u.growerId) {
    ctx.addIssue({ code: 'custom', path: ['growerId'], message: 'A farmer must belong to a grower' });
  }
}

export const inviteUserSchema = z
  .object({ email: emailSchema, name: nameText('Name'), role: roleSchema, ...assignment })
  .superRefine(checkAssignment);
export type InviteUserInput = z.input<typeof inviteUserSchema>;

export const updateUserSchema = z
  .object({
    name: nameText('Name'),
    role: roleSchema,
    status: z.enum(['active', 'disabled']).optional(),
    version: z.number().int().min(0),
    ...assignment,
  })
  .superRefine(checkAssignment);

export const userSchema = z.object({
  id: idSchema,
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  status: userStatusSchema,
  growerId: idSchema.nullable(),
  growerIds: z.array(idSchema),
  version: z.number(),
  lastSignInAt: z.string().nullable(),
  createdAt: z.string(),
});
export type User = z.infer<typeof userSchema>;
export const userListSchema = z.object({ items: z.array(userSchema) });

export const mailMessageSchema = z.object({
  id: z.string(),
  to: z.array(z.string()),
  from: z.string(),
  subject: z.string(),
  text: z.string(),
  receivedAt: z.string(),
});
export const mailListSchema = z.object({ items: z.array(mailMessageSchema) });
export type MailMessage = z.infer<typeof mailMessageSchema>;
