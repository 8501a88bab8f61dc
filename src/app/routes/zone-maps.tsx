import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunction } from 'react-router-dom';
import { PageHeader } from '@/components/ui/page-header';
import { QueryState } from '@/components/ui/query-state';
import { zoneMapsQueryOptions, useZoneMaps } from '@/features/zones/api/get-zone-maps';
import { ZoneMapTable } from '@/features/zones/components/zone-map-table';
import { canEditRegister } from '@/lib/permissions';
import { useViewer } from '@/lib/viewer';

export const loader =
  (qc: QueryClient): LoaderFunction =>
  () => {
    void qc.prefetchQuery(zoneMapsQueryOptions());
    return null;
  };

export function Component() {
  const maps = useZoneMaps();
  const canEdit = canEditRegister(useViewer());
  return (
    <>
      <PageHeader
        title="Zone maps"
        description="Management zones of each field, per crop season, with every version kept."
      />
      <QueryState query={maps}>
        {(items) => (
          <ZoneMapTable
            items={items}
            empty={
              canEdit
                ? 'Open a field and choose "New zone map" to make one.'
                : 'None has been made for your fields yet.'
            }
          />
        )}
      </QueryState>
    </>
  );
}
