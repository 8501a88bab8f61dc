import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ZoneMap } from '@shared/schemas/zone-map.schema';
import { isStaleVersion } from '@/components/form/use-save-errors';
import { resourceKeys } from '@/lib/query-keys';

export const zoneMapKeys = resourceKeys('zone-maps');

/**
 * A mutation answering a whole zone map (a new one, or one edit of it): the answer replaces the cached
 * detail and the lists reload. A 409 (someone else changed the map since it was read) reloads the map, and
 * the caller says so.
 */
export function useZoneMapMutation<V>(mutationFn: (variables: V) => Promise<ZoneMap>, mapId?: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn,
    onSuccess: async (map) => {
      qc.setQueryData(zoneMapKeys.detail(map.id), map);
      await qc.invalidateQueries({ queryKey: zoneMapKeys.lists() });
    },
    onError: async (error) => {
      if (mapId && isStaleVersion(error)) await qc.invalidateQueries({ queryKey: zoneMapKeys.detail(mapId) });
    },
  });
}
