import { z } from 'zod';
import { idSchema, nameText, optionalText, versionSchema } from './common.schema';

const phone = z
  .string()
  .trim()
  .max(40, 'At most 40 characters')
  .regex(/^[0-9+()\-.\s]*$/, 'Use digits, spaces and + ( ) - . only')
  .optional()
  .nullable()
  .transform((v) => (v ? v : null));

const optionalEmail = z
  .string()
  .trim()
  .toLowerCase()
  .max(254)
  .optional()
  .nullable()
  .transform((v) => (v ? v : null))
  .pipe(z.email({ message: 'Not a valid e-mail address' }).nullable());

export const growerInputSchema = z.object({
  name: nameText('Name'),
  contactName: optionalText(120),
  email: optionalEmail,
  phone,
  notes: optionalText(),
});
export type GrowerInput = z.input<typeof growerInputSchema>;

export const growerUpdateSchema = growerInputSchema.extend({ version: versionSchema });

export const growerSchema = z.object({
  id: idSchema,
  name: z.string(),
  contactName: z.string().nullable(),
  email: z.string().nullable(),
  phone: z.string().nullable(),
  notes: z.string().nullable(),
  archivedAt: z.string().nullable(),
  version: z.number(),
  farmCount: z.number(),
  fieldCount: z.number(),
  planterCount: z.number(),
  updatedAt: z.string(),
});
export type Grower = z.infer<typeof growerSchema>;
export const growerListSchema = z.object({ items: z.array(growerSchema) });
