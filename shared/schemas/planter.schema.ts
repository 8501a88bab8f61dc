import { z } from 'zod';
import { idSchema, listQuerySchema, nameText, optionalText, versionSchema } from './common.schema';
import { cropSchema } from './crops';
import { countSections, minRowsPerSection } from '../rates/count-sections';

export const GROUND_SPEED_SOURCES = ['radar', 'wheel', 'gnss'] as const;
export const groundSpeedSourceSchema = z.enum(GROUND_SPEED_SOURCES, {
  message: 'Choose a ground-speed source',
});
export const GROUND_SPEED_SOURCE_LABELS: Record<(typeof GROUND_SPEED_SOURCES)[number], string> = {
  radar: 'Radar on the planter',
  wheel: 'Tractor wheel sensor',
  gnss: 'GNSS receiver',
};

export const ARRANGEMENTS = ['single', 'split-row'] as const;
export const arrangementSchema = z.enum(ARRANGEMENTS);
export const ARRANGEMENT_LABELS: Record<(typeof ARRANGEMENTS)[number], string> = {
  single: 'Single rank',
  'split-row': 'Split-row (interplant rows)',
};

const int = (label: string, min: number, max: number) =>
  z
    .number({ message: `${label} is required` })
    .int(`${label} must be a whole number`)
    .min(min, `${label} must be at least ${min}`)
    .max(max, `${label} must be at most ${max}`);

const num = (label: string, min: number, max: number, unitNote: string) =>
  z
    .number({ message: `${label} is required` })
    .finite()
    .min(min, `${label} must be at least ${min} ${unitNote}`)
    .max(max, `${label} must be at most ${max} ${unitNote}`);

export const holesPerDiscSchema = z
  .array(z.object({ crop: cropSchema, holes: int('Holes per disc', 1, 300) }))
  .min(1, 'Give the holes per disc for at least one crop')
  .refine((list) => new Set(list.map((h) => h.crop)).size === list.length, 'Each crop may appear once');

/**
 * A planter profile. Stored in SI: row spacing in metres, speeds in metres per second, disc speed in
 * revolutions per minute. The row count is the full physical count of row units, split-row or not.
 */
const planterFields = z.object({
  growerId: idSchema,
  name: nameText('Name'),
  rowCount: int('Rows', 1, 96),
  rowSpacingM: num('Row spacing', 0.1, 1.6, 'm'),
  arrangement: arrangementSchema,
  interplantRowCount: int('Interplant rows', 1, 95).nullable().optional(),
  rowsPerSection: int('Rows per section', 1, 96),
  displaySectionLimit: int('Section limit of the display', 1, 255),
  holesPerDisc: holesPerDiscSchema,
  discRpmMin: num('Lowest disc speed', 0, 300, 'rpm'),
  discRpmMax: num('Highest disc speed', 1, 300, 'rpm'),
  speedMinMps: num('Lowest planting speed', 0.2, 10, 'm/s'),
  speedPlannedMps: num('Planned speed', 0.2, 10, 'm/s'),
  speedMaxMps: num('Highest planting speed', 0.2, 10, 'm/s'),
  groundSpeedSource: groundSpeedSourceSchema,
  notes: optionalText(),
});

type PlanterShape = z.infer<typeof planterFields>;

function checkPlanter(p: Omit<PlanterShape, 'growerId'>, ctx: z.RefinementCtx) {
  if (p.rowsPerSection > p.rowCount) {
    ctx.addIssue({
      code: 'custom',
      path: ['rowsPerSection'],
      message: 'Rows per section cannot exceed the rows',
    });
  } else {
    const sections = countSections(p.rowCount, p.rowsPerSection);
    if (sections > p.displaySectionLimit) {
      const need = minRowsPerSection(p.rowCount, p.displaySectionLimit);
      ctx.addIssue({
        code: 'custom',
        path: ['rowsPerSection'],
        message: `${p.rowCount} rows at ${p.rowsPerSection} per section make ${sections} sections, more than the display's ${p.displaySectionLimit}: use at least ${need} rows per section`,
      });
    }
  }
  if (p.arrangement === 'split-row') {
    if (p.interplantRowCount == null) {
      ctx.addIssue({
        code: 'custom',
        path: ['interplantRowCount'],
        message: 'A split-row planter needs its interplant row count',
      });
    } else if (p.interplantRowCount >= p.rowCount) {
      ctx.addIssue({
        code: 'custom',
        path: ['interplantRowCount'],
        message: 'Interplant rows must be fewer than all rows',
      });
    }
  }
  if (p.discRpmMin >= p.discRpmMax) {
    ctx.addIssue({
      code: 'custom',
      path: ['discRpmMax'],
      message: 'The highest disc speed must exceed the lowest',
    });
  }
  if (p.speedMinMps > p.speedPlannedMps) {
    ctx.addIssue({
      code: 'custom',
      path: ['speedPlannedMps'],
      message: 'The planned speed cannot be below the lowest speed',
    });
  }
  if (p.speedPlannedMps > p.speedMaxMps) {
    ctx.addIssue({
      code: 'custom',
      path: ['speedMaxMps'],
      message: 'The highest speed cannot be below the planned speed',
    });
  }
}

export const planterInputSchema = planterFields.superRefine(checkPlanter).transform((p) => ({
  ...p,
  interplantRowCount: p.arrangement === 'split-row' ? (p.interplantRowCount ?? null) : null,
}));
export type PlanterInput = z.input<typeof planterInputSchema>;

/** A planter stays with its grower. */
export const planterUpdateSchema = planterFields
  .omit({ growerId: true })
  .extend({ version: versionSchema })
  .superRefine(checkPlanter)
  .transform((p) => ({
    ...p,
    interplantRowCount: p.arrangement === 'split-row' ? (p.interplantRowCount ?? null) : null,
  }));

export const planterSchema = z.object({
  id: idSchema,
  growerId: idSchema,
  growerName: z.string(),
  name: z.string(),
  rowCount: z.number(),
  rowSpacingM: z.number(),
  arrangement: arrangementSchema,
  interplantRowCount: z.number().nullable(),
  rowsPerSection: z.number(),
  displaySectionLimit: z.number(),
  sectionCount: z.number(),
  holesPerDisc: z.array(z.object({ crop: cropSchema, holes: z.number() })),
  discRpmMin: z.number(),
  discRpmMax: z.number(),
  speedMinMps: z.number(),
  speedPlannedMps: z.number(),
  speedMaxMps: z.number(),
  groundSpeedSource: groundSpeedSourceSchema,
  notes: z.string().nullable(),
  archivedAt: z.string().nullable(),
  version: z.number(),
  updatedAt: z.string(),
});
export type Planter = z.infer<typeof planterSchema>;
export const planterListSchema = z.object({ items: z.array(planterSchema) });

export const planterListQuerySchema = listQuerySchema.extend({ growerId: idSchema.optional() });
