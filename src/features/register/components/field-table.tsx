import type { ColumnDef } from '@tanstack/react-table';
import type { Field } from '@shared/schemas/field.schema';
import { Badge } from '@/components/ui/badge';
import { useUnitSystem } from '@/lib/viewer';
import { actionsColumn, areaColumn, nameColumn, parentColumn, updatedColumn } from './columns';
import { RegisterTable } from './register-table';

export function FieldTable({
  fields,
  canEdit,
  hiddenColumns,
}: {
  fields: Field[];
  canEdit: boolean;
  hiddenColumns?: string[];
}) {
  const system = useUnitSystem();
  const columns: ColumnDef<Field, unknown>[] = [
    nameColumn((f) => `/fields/${f.id}`),
    parentColumn(
      'farm',
      'Farm',
      (f) => f.farmName,
      (f) => `/fields?growerId=${f.growerId}&farmId=${f.farmId}`,
    ),
    parentColumn(
      'grower',
      'Grower',
      (f) => f.growerName,
      (f) => `/growers/${f.growerId}`,
    ),
    areaColumn(system, (f) => f.areaM2),
    {
      id: 'boundary',
      header: 'Boundary',
      accessorFn: (f) => (f.boundary ? 1 : 0),
      cell: ({ row }) =>
        row.original.boundary ? <Badge tone="ok">On file</Badge> : <Badge tone="caution">Missing</Badge>,
    },
    updatedColumn(),
  ];
  if (canEdit)
    columns.push(
      actionsColumn(
        'fields',
        (f) => `/fields/${f.id}/edit`,
        () => true,
      ),
    );
  return (
    <RegisterTable
      label="Fields"
      data={fields}
      columns={columns}
      hiddenColumns={hiddenColumns}
      empty={{ title: 'No fields here', text: "Fields belong to a farm. A field's boundary gives its area." }}
    />
  );
}
