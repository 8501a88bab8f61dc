import type { ZoneMap } from '@shared/schemas/zone-map.schema';
import { areaToDisplay, areaUnitLabel, type UnitSystem } from '@shared/units';
import { Badge } from '@/components/ui/badge';
import { formatNumber } from '@/lib/format';
import type { ZoneColouring } from './zone-colours';
import { SLIVER_M2 } from './slivers';

const th = 'px-3 py-1.5 text-xs font-medium text-ink-soft';
const num = 'px-3 py-1.5 text-right font-mono tabular-nums';

/**
 * Every zone with its area (acres or hectares, measured on the ellipsoid by the server), and under them
 * the sum set against the boundary's area, with what is left uncovered and what is counted twice.
 */
export function ZoneTable({
  map,
  system,
  colouring,
  selectedIds,
  onSelect,
}: {
  map: ZoneMap;
  system: UnitSystem;
  colouring: ZoneColouring;
  selectedIds: string[];
  onSelect: (id: string, add: boolean) => void;
}) {
  const zones = map.zones.features.map((f) => f.properties);
  const unit = areaUnitLabel(system);
  const area = (m2: number) => formatNumber(areaToDisplay(m2, system), 2);
  const sumM2 = zones.reduce((s, z) => s + z.areaM2, 0);
  const { boundaryAreaM2, gapAreaM2 } = map.analysis;
  const overlapM2 = map.analysis.overlaps.reduce((s, o) => s + o.areaM2, 0);
  const share = (m2: number) =>
    boundaryAreaM2 > 0 ? `${formatNumber((100 * m2) / boundaryAreaM2, 1)} %` : '—';
  const hasMean = zones.some((z) => z.meanValue != null);
  return (
    <div className="overflow-x-auto rounded-card border border-ink-line bg-paper-raised">
      <table className="w-full border-collapse text-sm" aria-label="Zones">
        <thead>
          <tr className="border-b border-ink-line bg-paper-sunk/60">
            <th scope="col" className={`${th} text-left`}>
              Zone
            </th>
            <th scope="col" className={`${th} text-right`}>
              Class
            </th>
            <th scope="col" className={`${th} text-right`}>
              Productivity index
            </th>
            {hasMean ? (
              <th scope="col" className={`${th} text-right`}>
                Mean of the data
              </th>
            ) : null}
            <th scope="col" className={`${th} text-right`}>
              Area ({unit})
            </th>
            <th scope="col" className={`${th} text-right`}>
              Share of the field
            </th>
          </tr>
        </thead>
        <tbody>
          {zones.map((z) => (
            <tr
              key={z.id}
              aria-selected={selectedIds.includes(z.id)}
              className={`border-b border-ink-line/70 ${selectedIds.includes(z.id) ? 'bg-clay-50' : 'hover:bg-paper'}`}
            >
              <th scope="row" className="px-3 py-1.5 text-left font-normal">
                <button
                  type="button"
                  className="inline-flex cursor-pointer items-center gap-2 rounded-sm text-left hover:text-clay-700 hover:underline"
                  onClick={(e) => onSelect(z.id, e.shiftKey || e.metaKey || e.ctrlKey)}
                  title="Choose this zone (hold Shift to choose a second)"
                >
                  <span
                    aria-hidden
                    className="inline-block h-3 w-4 shrink-0 rounded-[2px] border border-ink/30"
                    style={{ backgroundColor: colouring.colourOf(z) }}
                  />
                  <span className="font-medium text-ink">{z.name}</span>
                  {z.isDefault ? <Badge>Default</Badge> : null}
                </button>
              </th>
              <td className={num}>{z.classValue ?? '—'}</td>
              <td className={num}>
                {z.productivityIndex == null ? '—' : formatNumber(z.productivityIndex, 2)}
              </td>
              {hasMean ? (
                <td className={num}>{z.meanValue == null ? '—' : formatNumber(z.meanValue, 2)}</td>
              ) : null}
              <td className={num}>{area(z.areaM2)}</td>
              <td className={num}>{share(z.areaM2)}</td>
            </tr>
          ))}
        </tbody>
        <tfoot className="border-t-2 border-ink-line bg-paper-sunk/40">
          <tr data-row="zones-total">
            <th scope="row" className="px-3 py-1.5 text-left font-medium">
              All zones ({zones.length})
            </th>
            <td colSpan={hasMean ? 3 : 2} />
            <td className={`${num} font-medium`}>{area(sumM2)}</td>
            <td className={num}>{share(sumM2)}</td>
          </tr>
          <tr data-row="boundary">
            <th scope="row" className="px-3 py-1.5 text-left font-medium">
              Field boundary
            </th>
            <td colSpan={hasMean ? 3 : 2} />
            <td className={`${num} font-medium`}>{area(boundaryAreaM2)}</td>
            <td className={num}>100.0 %</td>
          </tr>
          {gapAreaM2 >= SLIVER_M2 || overlapM2 >= SLIVER_M2 ? (
            <tr>
              <td colSpan={hasMean ? 6 : 5} className="px-3 py-1.5 text-xs text-ink-soft">
                {gapAreaM2 >= SLIVER_M2 ? `${area(gapAreaM2)} ${unit} of the field is in no zone. ` : ''}
                {overlapM2 >= SLIVER_M2
                  ? `${area(overlapM2)} ${unit} lies in two zones at once and is counted twice above.`
                  : ''}
              </td>
            </tr>
          ) : null}
        </tfoot>
      </table>
    </div>
  );
}
