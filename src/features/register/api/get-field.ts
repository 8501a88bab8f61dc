import { queryOptions, useQuery } from '@tanstack/react-query';
import { fieldSchema } from '@shared/schemas/field.schema';
import { api } from '@/lib/api-client';
import { fieldKeys } from './keys';

/** GET /api/fields/:id: one field, archived or not; 404 when outside the user's scope. */
export const getField = async (id: string) =>
  fieldSchema.parse(await api.get(`/api/fields/${encodeURIComponent(id)}`));

export const fieldQueryOptions = (id: string) =>
  queryOptions({ queryKey: fieldKeys.detail(id), queryFn: () => getField(id) });

export const useField = (id: string) => useQuery(fieldQueryOptions(id));
