import { useQuery, type QueryClient } from '@tanstack/react-query';
import { useNavigate, useParams, type LoaderFunction } from 'react-router-dom';
import type { Product } from '@shared/schemas/product.schema';
import { Badge } from '@/components/ui/badge';
import { NotAllowed } from '@/components/ui/not-allowed';
import { PageHeader } from '@/components/ui/page-header';
import { QueryState } from '@/components/ui/query-state';
import { productQueryOptions } from '@/features/products/api/get-product';
import { ProductArchiveButton } from '@/features/products/components/product-archive';
import { ProductFacts } from '@/features/products/components/product-facts';
import { ProductForm } from '@/features/products/components/product-form';
import { canEditRegister } from '@/lib/permissions';
import { useViewer } from '@/lib/viewer';

export const loader =
  (qc: QueryClient): LoaderFunction =>
  ({ params }) => {
    if (params.id) void qc.prefetchQuery(productQueryOptions(params.id));
    return null;
  };

const CRUMBS = [{ label: 'Products', to: '/products' }];

/** A product's page: the form for those who may change it, its facts for everyone else or while archived. */
function ProductPage({ product: p }: { product: Product }) {
  const navigate = useNavigate();
  const canEdit = canEditRegister(useViewer());
  const archived = !!p.archivedAt;
  return (
    <>
      <PageHeader
        crumbs={[...CRUMBS, { label: p.name }]}
        title={
          <>
            {p.name}
            {archived ? <Badge>Archived</Badge> : null}
          </>
        }
        description={
          canEdit && !archived
            ? 'The unit size is in your units; switch units in the left rail.'
            : canEdit
              ? 'Restore it to change it.'
              : 'Your agronomist keeps the products; you can read them here.'
        }
        actions={canEdit ? <ProductArchiveButton product={p} /> : null}
      />
      {canEdit && !archived ? (
        <ProductForm key={p.id} product={p} cancelTo="/products" onSaved={() => navigate('/products')} />
      ) : (
        <ProductFacts product={p} />
      )}
    </>
  );
}

export function Component() {
  const { id } = useParams();
  const navigate = useNavigate();
  const canEdit = canEditRegister(useViewer());
  const query = useQuery({ ...productQueryOptions(id ?? ''), enabled: !!id });
  if (!id) {
    if (!canEdit) return <NotAllowed what="adding products" />;
    return (
      <>
        <PageHeader
          title="Add a product"
          crumbs={CRUMBS}
          description="The unit size is in your units; switch units in the left rail."
        />
        <ProductForm cancelTo="/products" onSaved={() => navigate('/products')} />
      </>
    );
  }
  return <QueryState query={query}>{(p) => <ProductPage product={p} />}</QueryState>;
}
