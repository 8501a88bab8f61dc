import { queryOptions, useQuery } from '@tanstack/react-query';
import { seasonSchema } from '@shared/schemas/season.schema';
import { api } from '@/lib/api-client';
import { seasonKeys } from './keys';

/** GET /api/seasons/:id: one season, archived or not; 404 when outside the user's scope. */
export const getSeason = async (id: string) =>
  seasonSchema.parse(await api.get(`/api/seasons/${encodeURIComponent(id)}`));

export const seasonQueryOptions = (id: string) =>
  queryOptions({ queryKey: seasonKeys.detail(id), queryFn: () => getSeason(id) });

export const useSeason = (id: string) => useQuery(seasonQueryOptions(id));
