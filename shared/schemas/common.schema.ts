import { z } from 'zod';

export const idSchema = z.uuid({ message: 'Not a valid id' });
export const idParamsSchema = z.object({ id: idSchema });

/** Trimmed, required text of bounded length. */
export const nameText = (label: string, max = 120) =>
  z
    .string({ message: `${label} is required` })
    .trim()
    .min(1, `${label} is required`)
    .max(max, `${label} must be at most ${max} characters`);

export const optionalText = (max = 2000) =>
  z
    .string()
    .trim()
    .max(max, `At most ${max} characters`)
    .optional()
    .nullable()
    .transform((v) => (v ? v : null));

export const versionSchema = z.number({ message: 'version is required' }).int().min(0);

/** Query of a list: archived records are hidden unless asked for. */
export const listQuerySchema = z.object({
  archived: z
    .enum(['true', 'false', 'only'])
    .optional()
    .transform((v) => v ?? 'false'),
});

/** The one error shape every API error answers with. */
export const apiErrorSchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    details: z
      .array(z.object({ path: z.array(z.union([z.string(), z.number()])), message: z.string() }))
      .optional(),
  }),
});
export type ApiError = z.infer<typeof apiErrorSchema>;

export const timestamps = {
  createdAt: z.string(),
  updatedAt: z.string(),
};
