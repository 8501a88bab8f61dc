import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunction } from 'react-router-dom';
import { CROP_LABELS, CROPS, type Crop } from '@shared/schemas/crops';
import { ButtonLink } from '@/components/ui/button';
import { FilterBar, FilterSelect, ShowArchivedToggle } from '@/components/ui/filter-bar';
import { PageHeader } from '@/components/ui/page-header';
import { QueryState } from '@/components/ui/query-state';
import {
  productsQueryOptions,
  useProducts,
  type ProductListParams,
} from '@/features/products/api/get-products';
import { ProductTable } from '@/features/products/components/product-table';
import { canEditRegister } from '@/lib/permissions';
import { useFilterParams } from '@/lib/use-filter-params';
import { useViewer } from '@/lib/viewer';

export const loader =
  (qc: QueryClient): LoaderFunction =>
  ({ request }) => {
    void qc.prefetchQuery(productsQueryOptions(listParams(new URL(request.url).searchParams)));
    return null;
  };

const KINDS = [
  { id: 'seed', name: 'Seed' },
  { id: 'other', name: 'Other products' },
];

/** The list's parameters from the address; unknown values are ignored rather than sent. */
function listParams(search: { get(name: string): string | null }): ProductListParams {
  const kind = search.get('kind');
  const crop = search.get('crop');
  return {
    archived: search.get('archived') === 'true' ? 'true' : undefined,
    kind: kind === 'seed' || kind === 'other' ? kind : undefined,
    crop: kind !== 'other' && CROPS.includes(crop as Crop) ? (crop as Crop) : undefined,
  };
}

export function Component() {
  const me = useViewer();
  const [values, set] = useFilterParams(['kind', 'crop', 'archived'] as const);
  const params = listParams({ get: (name) => values[name as keyof typeof values] || null });
  const products = useProducts(params);
  const canEdit = canEditRegister(me);
  return (
    <>
      <PageHeader
        title="Products"
        description="Seed and other products that prescriptions apply: what one purchase unit holds and what it costs."
        actions={
          canEdit ? (
            <ButtonLink variant="primary" to="/products/new">
              Add product
            </ButtonLink>
          ) : null
        }
      />
      <FilterBar>
        <FilterSelect
          label="Kind"
          allLabel="Every kind"
          value={params.kind ?? ''}
          options={KINDS}
          onChange={(v) => set('kind', v, v === 'other' ? ['crop'] : [])}
        />
        {params.kind === 'other' ? null : (
          <FilterSelect
            label="Crop"
            allLabel="Every crop"
            value={params.crop ?? ''}
            options={CROPS.map((c) => ({ id: c, name: CROP_LABELS[c] }))}
            onChange={(v) => set('crop', v)}
          />
        )}
        <ShowArchivedToggle
          checked={params.archived === 'true'}
          onChange={(on) => set('archived', on ? 'true' : '')}
        />
      </FilterBar>
      <QueryState query={products}>
        {(items) => (
          <ProductTable
            products={items}
            empty={
              canEdit
                ? 'Add the seed you plan to sow, with the seeds in one unit and its price, to total up orders.'
                : 'Your agronomist has not added any products that match.'
            }
          />
        )}
      </QueryState>
    </>
  );
}
