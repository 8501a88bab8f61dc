import type { ColumnDef } from '@tanstack/react-table';
import type { Grower } from '@shared/schemas/grower.schema';
import { actionsColumn, nameColumn, numberColumn, textColumn, updatedColumn } from './columns';
import { RegisterTable } from './register-table';

export function GrowerTable({ growers, canEdit }: { growers: Grower[]; canEdit: boolean }) {
  const columns: ColumnDef<Grower, unknown>[] = [
    nameColumn((g) => `/growers/${g.id}`),
    textColumn('contact', 'Contact', (g) => g.contactName),
    numberColumn('farms', 'Farms', (g) => g.farmCount),
    numberColumn('fields', 'Fields', (g) => g.fieldCount),
    numberColumn('planters', 'Planters', (g) => g.planterCount),
    updatedColumn(),
  ];
  if (canEdit)
    columns.push(
      actionsColumn(
        'growers',
        (g) => `/growers/${g.id}/edit`,
        () => true,
      ),
    );
  return (
    <RegisterTable
      label="Growers"
      data={growers}
      columns={columns}
      empty={{
        title: 'No growers here',
        text: 'Growers you add, or that are assigned to you, are listed here.',
      }}
    />
  );
}
