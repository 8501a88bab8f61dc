import type { ColumnDef } from '@tanstack/react-table';
import { GROUND_SPEED_SOURCE_LABELS, type Planter } from '@shared/schemas/planter.schema';
import { lengthUnitLabel, rowSpacingToDisplay, speedToDisplay, speedUnitLabel } from '@shared/units';
import { formatNumber } from '@/lib/format';
import { useUnitSystem } from '@/lib/viewer';
import { actionsColumn, nameColumn, numberColumn, parentColumn, textColumn } from './columns';
import { RegisterTable } from './register-table';

export function PlanterTable({
  planters,
  canEdit,
  hiddenColumns,
}: {
  planters: Planter[];
  canEdit: (p: Planter) => boolean;
  hiddenColumns?: string[];
}) {
  const system = useUnitSystem();
  const columns: ColumnDef<Planter, unknown>[] = [
    nameColumn((p) => `/planters/${p.id}`),
    parentColumn(
      'grower',
      'Grower',
      (p) => p.growerName,
      (p) => `/growers/${p.growerId}`,
    ),
    numberColumn('rows', 'Rows', (p) => p.rowCount),
    numberColumn(
      'spacing',
      `Row spacing (${lengthUnitLabel(system)})`,
      (p) => p.rowSpacingM,
      (m) => formatNumber(rowSpacingToDisplay(m, system), 1),
    ),
    numberColumn('sections', 'Sections', (p) => p.sectionCount),
    numberColumn(
      'speed',
      `Planned speed (${speedUnitLabel(system)})`,
      (p) => p.speedPlannedMps,
      (v) => formatNumber(speedToDisplay(v, system), 1),
    ),
    textColumn('source', 'Ground speed from', (p) => GROUND_SPEED_SOURCE_LABELS[p.groundSpeedSource]),
  ];
  if (planters.some(canEdit))
    columns.push(actionsColumn('planters', (p) => `/planters/${p.id}/edit`, canEdit));
  return (
    <RegisterTable
      label="Planters"
      data={planters}
      columns={columns}
      hiddenColumns={hiddenColumns}
      empty={{
        title: 'No planters here',
        text: 'A planter profile tells Sowright what the machine can deliver.',
      }}
    />
  );
}
