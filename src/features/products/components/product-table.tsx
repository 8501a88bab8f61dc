import type { ColumnDef } from '@tanstack/react-table';
import { Link } from 'react-router-dom';
import { CROP_LABELS } from '@shared/schemas/crops';
import type { Product } from '@shared/schemas/product.schema';
import { Badge } from '@/components/ui/badge';
import { DataTable } from '@/components/ui/data-table';
import { EmptyState } from '@/components/ui/empty-state';
import { useUnitSystem } from '@/lib/viewer';
import { priceWords, unitSizeWords } from './product-values';

export const KIND_WORDS: Record<Product['kind'], string> = { seed: 'Seed', other: 'Other' };

/** Products with what one purchase unit holds and costs; archived rows dimmed. */
export function ProductTable({ products, empty }: { products: Product[]; empty: string }) {
  const system = useUnitSystem();
  const columns: ColumnDef<Product, unknown>[] = [
    {
      id: 'name',
      header: 'Name',
      accessorFn: (p) => p.name,
      sortingFn: 'text',
      cell: ({ row }) => (
        <span className="inline-flex items-center gap-2">
          <Link
            to={`/products/${row.original.id}`}
            className="font-medium text-ink underline-offset-2 hover:text-clay-700 hover:underline"
          >
            {row.original.name}
          </Link>
          {row.original.archivedAt ? <Badge>Archived</Badge> : null}
        </span>
      ),
    },
    { id: 'kind', header: 'Kind', accessorFn: (p) => KIND_WORDS[p.kind] },
    { id: 'crop', header: 'Crop', accessorFn: (p) => (p.crop ? CROP_LABELS[p.crop] : '—') },
    {
      id: 'unit',
      header: 'Unit size',
      accessorFn: (p) => p.unitSize,
      meta: { numeric: true },
      cell: ({ row }) => unitSizeWords(row.original, system),
    },
    {
      id: 'price',
      header: 'Price per unit',
      accessorFn: (p) => p.pricePerUnit ?? undefined,
      sortUndefined: 'last',
      meta: { numeric: true },
      cell: ({ row }) =>
        row.original.pricePerUnit == null ? (
          <span className="text-ink-faint">—</span>
        ) : (
          priceWords(row.original.pricePerUnit, row.original.currency)
        ),
    },
  ];
  return (
    <DataTable
      label="Products"
      data={products}
      columns={columns}
      initialSort={[{ id: 'name', desc: false }]}
      getRowId={(p) => p.id}
      rowClassName={(p) => (p.archivedAt ? 'text-ink-faint' : '')}
      empty={<EmptyState title="No products here">{empty}</EmptyState>}
    />
  );
}
