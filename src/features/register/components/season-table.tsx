import type { ColumnDef } from '@tanstack/react-table';
import { CROP_LABELS } from '@shared/schemas/crops';
import type { Season } from '@shared/schemas/season.schema';
import { formatCalendarDate } from '@/lib/format';
import { actionsColumn, numberColumn, parentColumn, textColumn } from './columns';
import { RegisterTable } from './register-table';

/** Crop seasons have no name of their own: "2026 corn on North block" stands for one in dialogs. */
type SeasonRow = Season & { name: string };
const seasonLabel = (s: Season) => `${s.year} ${CROP_LABELS[s.crop].toLowerCase()} on ${s.fieldName}`;

export function SeasonTable({
  seasons,
  canEdit,
  hiddenColumns,
}: {
  seasons: Season[];
  canEdit: boolean;
  hiddenColumns?: string[];
}) {
  const columns: ColumnDef<SeasonRow, unknown>[] = [
    numberColumn('year', 'Year', (s) => s.year, String),
    {
      id: 'crop',
      header: 'Crop',
      accessorFn: (s) => CROP_LABELS[s.crop],
      cell: ({ row, getValue }) => (
        <span className={row.original.archivedAt ? '' : 'font-medium'}>
          {getValue() as string}
          {row.original.archivedAt ? <span className="ml-2 text-xs">(archived)</span> : null}
        </span>
      ),
    },
    parentColumn(
      'field',
      'Field',
      (s) => s.fieldName,
      (s) => `/fields/${s.fieldId}`,
    ),
    textColumn('farm', 'Farm', (s) => s.farmName),
    parentColumn(
      'grower',
      'Grower',
      (s) => s.growerName,
      (s) => `/growers/${s.growerId}`,
    ),
    {
      id: 'planting',
      header: 'Planned planting',
      accessorFn: (s) => s.plannedPlantingDate ?? undefined,
      sortUndefined: 'last',
      cell: ({ row }) => formatCalendarDate(row.original.plannedPlantingDate),
    },
  ];
  if (canEdit) {
    columns.push(
      actionsColumn(
        'seasons',
        (s) => `/seasons/${s.id}/edit`,
        () => true,
      ),
    );
  }
  return (
    <RegisterTable
      label="Crop seasons"
      data={seasons.map((s): SeasonRow => ({ ...s, name: seasonLabel(s) }))}
      columns={columns}
      hiddenColumns={hiddenColumns}
      initialSort={[{ id: 'year', desc: true }]}
      empty={{
        title: 'No crop seasons here',
        text: 'A crop season says what is planted in a field in a year.',
      }}
    />
  );
}
