import { FilterBar, FilterSelect, ShowArchivedToggle } from '@/components/ui/filter-bar';
import { useFilterParams } from '@/lib/use-filter-params';
import { useFarms } from '../api/get-farms';
import { useFields } from '../api/get-fields';
import { useGrowers } from '../api/get-growers';
import type { ArchivedFilter } from '../api/keys';

type FilterName = 'growerId' | 'farmId' | 'fieldId' | 'archived';

/**
 * The filters of a register list, kept in the address. Returns the list parameters to fetch with and the
 * filter bar to draw. The grower picker is left out when the user sees one grower only (a farmer).
 */
export function useRegisterFilters(names: readonly FilterName[]) {
  const [values, set] = useFilterParams<FilterName>(['archived', ...names]);
  const growers = useGrowers();
  const farms = useFarms(values.growerId ? { growerId: values.growerId } : {}, names.includes('farmId'));
  const fields = useFields(values.growerId ? { growerId: values.growerId } : {}, names.includes('fieldId'));
  const archived: ArchivedFilter | undefined = values.archived === 'true' ? 'true' : undefined;
  const params = {
    archived,
    growerId: names.includes('growerId') ? values.growerId || undefined : undefined,
    farmId: names.includes('farmId') ? values.farmId || undefined : undefined,
    fieldId: names.includes('fieldId') ? values.fieldId || undefined : undefined,
  };
  const showGrowers = names.includes('growerId') && (growers.data?.length ?? 0) > 1;

  const bar = (
    <FilterBar>
      {showGrowers ? (
        <FilterSelect
          label="Grower"
          allLabel="All growers"
          value={values.growerId}
          options={growers.data ?? []}
          onChange={(v) => set('growerId', v, ['farmId', 'fieldId'])}
        />
      ) : null}
      {names.includes('farmId') ? (
        <FilterSelect
          label="Farm"
          allLabel="All farms"
          value={values.farmId}
          options={farms.data ?? []}
          onChange={(v) => set('farmId', v)}
        />
      ) : null}
      {names.includes('fieldId') ? (
        <FilterSelect
          label="Field"
          allLabel="All fields"
          value={values.fieldId}
          options={(fields.data ?? []).map((f) => ({ id: f.id, name: `${f.name} (${f.farmName})` }))}
          onChange={(v) => set('fieldId', v)}
        />
      ) : null}
      <ShowArchivedToggle
        checked={archived === 'true'}
        onChange={(on) => set('archived', on ? 'true' : '')}
      />
    </FilterBar>
  );
  return { params, values, bar };
}
