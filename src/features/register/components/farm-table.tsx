import type { ColumnDef } from '@tanstack/react-table';
import type { Farm } from '@shared/schemas/farm.schema';
import { useUnitSystem } from '@/lib/viewer';
import { actionsColumn, areaColumn, nameColumn, numberColumn, parentColumn, updatedColumn } from './columns';
import { RegisterTable } from './register-table';

/** Farms; a farm's name opens the list of its fields. */
export function FarmTable({
  farms,
  canEdit,
  hiddenColumns,
}: {
  farms: Farm[];
  canEdit: boolean;
  hiddenColumns?: string[];
}) {
  const system = useUnitSystem();
  const columns: ColumnDef<Farm, unknown>[] = [
    nameColumn((f) => `/fields?growerId=${f.growerId}&farmId=${f.id}`),
    parentColumn(
      'grower',
      'Grower',
      (f) => f.growerName,
      (f) => `/growers/${f.growerId}`,
    ),
    numberColumn('fields', 'Fields', (f) => f.fieldCount),
    areaColumn(system, (f) => f.areaM2),
    updatedColumn(),
  ];
  if (canEdit)
    columns.push(
      actionsColumn(
        'farms',
        (f) => `/farms/${f.id}/edit`,
        () => true,
      ),
    );
  return (
    <RegisterTable
      label="Farms"
      data={farms}
      columns={columns}
      hiddenColumns={hiddenColumns}
      empty={{ title: 'No farms here', text: "A farm groups a grower's fields." }}
    />
  );
}
