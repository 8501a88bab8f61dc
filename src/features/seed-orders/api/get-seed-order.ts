import { queryOptions, useQuery } from '@tanstack/react-query';
import { seedOrderSchema } from '@shared/schemas/prescription.schema';
import { api } from '@/lib/api-client';

export type SeedOrderParams = { growerId: string; year: number; drafts: boolean };

/**
 * Kept under the prescriptions prefix: anything that invalidates prescriptions (a rate saved, an approval)
 * refreshes an open order sheet too.
 */
export const seedOrderKey = (p: SeedOrderParams) => ['prescriptions', 'seed-order', p] as const;

/** GET /api/seed-orders?growerId&year&drafts: the grower's order per product for the year (JSON). */
export const getSeedOrder = async (p: SeedOrderParams) =>
  seedOrderSchema.parse(await api.get('/api/seed-orders', p));

/** The same order as CSV, for a plain download link. */
export const seedOrderCsvHref = (p: SeedOrderParams) =>
  `/api/seed-orders?${new URLSearchParams({
    growerId: p.growerId,
    year: String(p.year),
    drafts: String(p.drafts),
    format: 'csv',
  }).toString()}`;

export const seedOrderQueryOptions = (p: SeedOrderParams) =>
  queryOptions({ queryKey: seedOrderKey(p), queryFn: () => getSeedOrder(p) });

/** The order sheet, once a grower and a year are chosen. */
export const useSeedOrder = (p: SeedOrderParams | null) =>
  useQuery({ ...seedOrderQueryOptions(p ?? { growerId: '', year: 0, drafts: false }), enabled: !!p });
