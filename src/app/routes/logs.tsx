import { useMemo } from 'react';
import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunction } from 'react-router-dom';
import { ButtonLink } from '@/components/ui/button';
import { FilterBar, FilterSelect } from '@/components/ui/filter-bar';
import { PageHeader } from '@/components/ui/page-header';
import { QueryState } from '@/components/ui/query-state';
import { logsQueryOptions, useLogs } from '@/features/logs/api/get-logs';
import { LogTable } from '@/features/logs/components/log-table';
import { useGrowers } from '@/features/register/api/get-growers';
import { useFilterParams } from '@/lib/use-filter-params';
import { useViewer } from '@/lib/viewer';

export const loader =
  (qc: QueryClient): LoaderFunction =>
  ({ request }) => {
    const growerId = new URL(request.url).searchParams.get('growerId') || undefined;
    void qc.prefetchQuery(logsQueryOptions({ growerId }));
    return null;
  };

/** Who brings in logs (DEVELOPERS.md, as-applied routes): the office and the grower's farmers. */
const canUpload = (role: string) => role === 'admin' || role === 'agronomist' || role === 'farmer';

export function Component() {
  const me = useViewer();
  const [values, set] = useFilterParams(['growerId'] as const);
  const growers = useGrowers();
  const list = useLogs({ growerId: values.growerId || undefined });
  const manyGrowers = (growers.data?.length ?? 0) > 1;
  const growerNames = useMemo(
    () => (manyGrowers ? new Map((growers.data ?? []).map((g) => [g.id, g.name])) : undefined),
    [manyGrowers, growers.data],
  );
  const upload = canUpload(me.role);
  return (
    <>
      <PageHeader
        title="Logs and audits"
        description="What the planter recorded, read point by point and set against the prescription it planted: where it put down more or less seed than asked, and why."
        actions={
          upload ? (
            <ButtonLink variant="primary" to="/logs/new">
              Upload a log
            </ButtonLink>
          ) : null
        }
      />
      {manyGrowers ? (
        <FilterBar>
          <FilterSelect
            label="Grower"
            allLabel="All growers"
            value={values.growerId}
            options={growers.data ?? []}
            onChange={(v) => set('growerId', v)}
          />
        </FilterBar>
      ) : null}
      <QueryState query={list}>
        {(items) => (
          <LogTable
            items={items}
            growerNames={growerNames}
            empty={
              values.growerId
                ? { title: 'None match', text: 'No log of this grower yet.' }
                : upload
                  ? {
                      title: 'No logs yet',
                      text: 'Choose "Upload a log" to bring in what the planter recorded for a field planted with an approved prescription.',
                    }
                  : { title: 'No logs yet', text: 'None has been brought in for your growers yet.' }
            }
          />
        )}
      </QueryState>
    </>
  );
}
