import { buttonClass, Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { FilterBar, FilterSelect } from '@/components/ui/filter-bar';
import { Checkbox } from '@/components/ui/input';
import { PageHeader } from '@/components/ui/page-header';
import { QueryState } from '@/components/ui/query-state';
import { useGrowers } from '@/features/register/api/get-growers';
import { useSeasons } from '@/features/register/api/get-seasons';
import { seedOrderCsvHref, useSeedOrder } from '@/features/seed-orders/api/get-seed-order';
import { SeedOrderSheet } from '@/features/seed-orders/components/seed-order-sheet';
import { useFilterParams } from '@/lib/use-filter-params';

/**
 * A grower's seed order for a year: choose the grower and the year (the years their crop seasons are in),
 * then the sheet, to print or download as CSV. The choice is kept in the address.
 */
export function Component() {
  const [values, set] = useFilterParams(['growerId', 'year', 'drafts'] as const);
  const growers = useGrowers();
  const onlyGrower = growers.data?.length === 1 ? growers.data[0].id : '';
  const growerId = values.growerId || onlyGrower;
  const seasons = useSeasons(growerId ? { growerId } : {});
  const asked = /^\d{4}$/.test(values.year) ? Number(values.year) : null;
  const seasonYears = (growerId ? (seasons.data ?? []) : []).map((s) => s.year);
  const years = [...new Set(asked ? [...seasonYears, asked] : seasonYears)].sort((a, b) => b - a);
  const year = asked ?? years[0] ?? 0;
  const drafts = values.drafts === 'true';
  const params = growerId && year ? { growerId, year, drafts } : null;
  const order = useSeedOrder(params);

  let body;
  if (!growerId)
    body = (
      <EmptyState title="Choose a grower">
        The order totals every prescription of the grower's fields for one year, per product.
      </EmptyState>
    );
  else if (seasons.isPending) body = null;
  else if (!params)
    body = (
      <EmptyState title="No crop seasons yet">
        This grower has no crop seasons, so there is no year to order seed for.
      </EmptyState>
    );
  else body = <QueryState query={order}>{(o) => <SeedOrderSheet order={o} drafts={drafts} />}</QueryState>;

  return (
    <>
      <div className="print:hidden">
        <PageHeader
          title="Seed orders"
          description="What to buy for a grower's year, totalled from the prescriptions of their fields."
        />
        <FilterBar label="Order for">
          {(growers.data?.length ?? 0) > 1 || !onlyGrower ? (
            <FilterSelect
              label="Grower"
              allLabel={growers.isPending ? 'Loading…' : 'Choose a grower'}
              value={growerId}
              options={growers.data ?? []}
              onChange={(v) => set('growerId', v, ['year'])}
            />
          ) : null}
          {growerId ? (
            <FilterSelect
              label="Year"
              allLabel={years.length ? 'Newest' : 'No seasons'}
              value={asked ? String(asked) : ''}
              options={years.map((y) => ({ id: String(y), name: String(y) }))}
              onChange={(v) => set('year', v)}
            />
          ) : null}
          <Checkbox
            className="h-9"
            label="Include drafts"
            checked={drafts}
            onChange={(e) => set('drafts', e.target.checked ? 'true' : '')}
          />
          {params && order.data ? (
            <div className="ml-auto flex h-9 items-center gap-2">
              <Button onClick={() => window.print()}>Print</Button>
              <a className={buttonClass('secondary')} href={seedOrderCsvHref(params)} download>
                Download CSV
              </a>
            </div>
          ) : null}
        </FilterBar>
      </div>
      {body}
    </>
  );
}
